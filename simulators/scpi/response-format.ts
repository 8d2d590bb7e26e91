// Response data as IEEE 488.2 8.7 describes it (from memory): integers as NR1, reals as NR3 with an explicit
// decimal point and exponent. Reals are written with the shortest mantissa that reads back to the same
// double, so a setting queried back is exactly the value that was set.

/** SCPI-99's stand-ins for infinity and not-a-number (vol. 1, 7.2.1.5 (from memory)). */
export const SCPI_INFINITY = 9.9e37;
export const SCPI_NAN = 9.91e37;

export function nr1(value: number): string {
  return String(Math.round(value));
}

export function nr3(value: number): string {
  if (Number.isNaN(value)) return '9.91E37';
  if (value === Infinity) return '9.9E37';
  if (value === -Infinity) return '-9.9E37';
  const [mantissa, exponent] = value.toExponential().split('e');
  const digits = mantissa.includes('.') ? mantissa : `${mantissa}.0`;
  const e = Number(exponent);
  return `${digits}E${e < 0 ? '-' : '+'}${String(Math.abs(e)).padStart(2, '0')}`;
}

/** A channel list response, `(@101,201)`; `(@)` when empty. */
export function channelList(channels: Iterable<number>): string {
  return `(@${[...channels].join(',')})`;
}

/** IEEE 488.2 string response data: double quotes, inner quotes doubled. */
export function quoted(text: string): string {
  return `"${text.replace(/"/g, '""')}"`;
}
