// Plan files are JSON laid out for people: nested values that fit in a line of LINE_WIDTH characters are
// written on one line (a point with its band, a node's channels), everything else indented by two.
// Parsing the text gives exactly the value written: numbers keep JavaScript's round-trip form.
export const LINE_WIDTH = 160;

export function readableJson(value: unknown, indent = ''): string {
  const flat = JSON.stringify(value);
  if (flat === undefined) return 'null';
  if (value === null || typeof value !== 'object' || indent.length + flat.length <= LINE_WIDTH) return spaced(value, flat);
  const inner = `${indent}  `;
  if (Array.isArray(value)) {
    if (value.length === 0) return '[]';
    return `[\n${value.map((v) => inner + readableJson(v ?? null, inner)).join(',\n')}\n${indent}]`;
  }
  const entries = Object.entries(value as Record<string, unknown>).filter(([, v]) => v !== undefined);
  if (entries.length === 0) return '{}';
  return `{\n${entries.map(([k, v]) => `${inner}${JSON.stringify(k)}: ${readableJson(v, inner)}`).join(',\n')}\n${indent}}`;
}

/** One-line form with a space after ':' and ',' outside strings, for legibility. */
function spaced(value: unknown, flat: string): string {
  if (value === null || typeof value !== 'object') return flat;
  if (Array.isArray(value)) return `[${value.map((v) => spaced(v ?? null, JSON.stringify(v ?? null))).join(', ')}]`;
  const entries = Object.entries(value as Record<string, unknown>).filter(([, v]) => v !== undefined);
  return `{ ${entries.map(([k, v]) => `${JSON.stringify(k)}: ${spaced(v, JSON.stringify(v))}`).join(', ')} }`.replace('{  }', '{}');
}
