// Plain aligned text tables for terminal output (numbers right-aligned, text left-aligned).

export function textTable(header: string[], rows: string[][], rightAlign: boolean[] = []): string {
  const widths = header.map((h, c) => Math.max(h.length, ...rows.map((r) => (r[c] ?? '').length)));
  const line = (cells: string[]) =>
    cells
      .map((cell, c) => (rightAlign[c] ? cell.padStart(widths[c]) : cell.padEnd(widths[c])))
      .join('  ')
      .trimEnd();
  return [line(header), line(widths.map((w) => '-'.repeat(w))), ...rows.map(line)].join('\n') + '\n';
}
