// Every string that reaches the page from a file (board, node and part names, identities, messages) is
// text, never markup: the `html` tag escapes each value put into it, and only fragments already built by
// the tag (or marked with `trusted`, for our own CSS) pass through unchanged.

const ENTITIES: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' };

/** Text made safe for element content and for quoted attribute values. */
export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ENTITIES[c]);
}

/** A piece of markup built by `html` (or our own constant text): inserted as it is. */
export class Markup {
  constructor(readonly text: string) {}
  toString(): string {
    return this.text;
  }
}

/** What may be put into `html`: strings are escaped, numbers written out, nothing-values dropped. */
export type Fragment = Markup | string | number | boolean | null | undefined | readonly Fragment[];

function render(value: Fragment): string {
  if (value instanceof Markup) return value.text;
  if (Array.isArray(value)) return value.map(render).join('');
  if (value === null || value === undefined || value === false || value === true) return '';
  if (typeof value === 'number') return String(value);
  return escapeHtml(value as string);
}

/** Template tag: html`<td>${name}</td>` escapes `name`. */
export function html(strings: TemplateStringsArray, ...values: Fragment[]): Markup {
  let out = strings[0];
  for (let i = 0; i < values.length; i++) out += render(values[i]) + strings[i + 1];
  return new Markup(out);
}

/** Our own constant markup (the style sheet); never for anything read from a file. */
export function trusted(text: string): Markup {
  return new Markup(text);
}

/** Fragments one after another, with `separator` (plain text, escaped) between them. */
export function joinMarkup(parts: readonly Fragment[], separator = ''): Markup {
  return new Markup(parts.map(render).join(escapeHtml(separator)));
}
