// Canonical JSON text: object keys sorted by UTF-16 code units, no whitespace, numbers in ECMAScript's
// shortest round-trip form, `undefined` fields left out (the scheme of RFC 8785, JSON Canonicalization
// Scheme). Two equal values always give the same text, whatever order their fields were built in.
export function canonicalJson(value: unknown): string {
  if (value === null || typeof value !== 'object') {
    if (typeof value === 'number' && !Number.isFinite(value)) throw new RangeError(`canonical JSON has no form for ${value}`);
    return JSON.stringify(value);
  }
  if (Array.isArray(value)) return `[${value.map((v) => (v === undefined ? 'null' : canonicalJson(v))).join(',')}]`;
  const entries = Object.entries(value as Record<string, unknown>)
    .filter(([, v]) => v !== undefined)
    .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
  return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonicalJson(v)}`).join(',')}}`;
}
