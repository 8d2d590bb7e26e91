// Simulated time. Zero means no timer at all, so tests with instantaneous instruments stay deterministic.

export function delay(ms: number): Promise<void> {
  if (!(ms > 0)) return Promise.resolve();
  return new Promise((resolve) => setTimeout(resolve, ms));
}
