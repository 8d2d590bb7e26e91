// Command templates of instrument profiles: literal text with placeholders {name}, or {name:0W} for a
// whole number zero-padded to W digits. Numbers are written so they read back to the same double, in
// the decimal numeric program data form of IEEE 488.2 (7.7.2 (from memory)): "163000", "0.005", "1E-7".

export type TemplatePart = string | { name: string; width?: number };

export interface Template {
  source: string;
  parts: TemplatePart[];
  /** The placeholder names used, in order of first use. */
  names: string[];
}

const PLACEHOLDER = /\{([A-Za-z_]+)(?::0([1-9]))?\}/g;

/** Parses `source`; a problem (one phrase) when it has a stray brace or a name not in `allowed`. */
export function parseTemplate(source: string, allowed: readonly string[]): Template | { problem: string } {
  const parts: TemplatePart[] = [];
  const names: string[] = [];
  let at = 0;
  for (const match of source.matchAll(PLACEHOLDER)) {
    const literal = source.slice(at, match.index);
    if (/[{}]/.test(literal)) return { problem: `has a brace that is not part of a placeholder {name}: ${JSON.stringify(source)}` };
    if (literal) parts.push(literal);
    const name = match[1];
    if (!allowed.includes(name)) {
      const choice = allowed.length > 0 ? `; allowed here: ${allowed.map((a) => `{${a}}`).join(', ')}` : '; this command takes none';
      return { problem: `unknown placeholder {${name}}${choice}` };
    }
    parts.push(match[2] ? { name, width: Number(match[2]) } : { name });
    if (!names.includes(name)) names.push(name);
    at = match.index + match[0].length;
  }
  const tail = source.slice(at);
  if (/[{}]/.test(tail)) return { problem: `has a brace that is not part of a placeholder {name}: ${JSON.stringify(source)}` };
  if (tail) parts.push(tail);
  return { source, parts, names };
}

export function isTemplate(value: Template | { problem: string }): value is Template {
  return 'parts' in value;
}

/** Fills the placeholders; numbers in program data form, padded ones as zero-padded whole numbers. */
export function renderTemplate(template: Template, values: Record<string, string | number>): string {
  return template.parts
    .map((part) => {
      if (typeof part === 'string') return part;
      const value = values[part.name];
      if (value === undefined) throw new Error(`template ${JSON.stringify(template.source)}: no value for {${part.name}}`);
      if (typeof value === 'string') return value;
      return part.width ? String(Math.trunc(value)).padStart(part.width, '0') : programNumber(value);
    })
    .join('');
}

/** The shortest decimal text that reads back to `value`, with an upper-case exponent mark. */
export function programNumber(value: number): string {
  if (!Number.isFinite(value)) throw new Error(`cannot send ${value} as a number`);
  return String(value).replace('e', 'E');
}
