// Shared timing helpers for the benchmarks (not a benchmark module itself).

/** Median wall time in ms of `fn` over `repeats` runs after `warmup` untimed runs. */
export function medianMs(fn: () => unknown, repeats: number, warmup = 1): number {
  for (let i = 0; i < warmup; i++) fn();
  const times: number[] = [];
  for (let i = 0; i < repeats; i++) {
    const t0 = performance.now();
    fn();
    times.push(performance.now() - t0);
  }
  times.sort((a, b) => a - b);
  return times[Math.floor(times.length / 2)];
}

export function printTable(title: string, header: string[], rows: string[][]): void {
  const widths = header.map((h, c) => Math.max(h.length, ...rows.map((r) => r[c].length)));
  const line = (cells: string[]) => cells.map((s, c) => s.padStart(widths[c])).join('  ');
  console.log(`\n${title}`);
  console.log(line(header));
  console.log(widths.map((w) => '-'.repeat(w)).join('  '));
  for (const r of rows) console.log(line(r));
}
