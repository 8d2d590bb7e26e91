// Frequency grids for sweeps: linear or logarithmic, endpoints included.

export function linearGrid(start: number, stop: number, points: number): number[] {
  if (points === 1) return [start];
  const step = (stop - start) / (points - 1);
  return Array.from({ length: points }, (_, i) => (i === points - 1 ? stop : start + i * step));
}

export function logGrid(start: number, stop: number, points: number): number[] {
  if (points === 1) return [start];
  const ratio = Math.log(stop / start) / (points - 1);
  return Array.from({ length: points }, (_, i) => (i === points - 1 ? stop : start * Math.exp(i * ratio)));
}
