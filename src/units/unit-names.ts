// The quantities topoprobe reads, with the names used in messages and the symbols used in output.

export type UnitName = 'F' | 'H' | 'ohm' | 'Hz' | 'V' | 'A' | 's';

export interface UnitInfo {
  /** Plural name for messages: "is in henries, expected farads". */
  plural: string;
  /** Symbol for printing (Ω for ohm). */
  symbol: string;
  /** The same unit as mathjs names it, for conversions. */
  mathjs: string;
}

export const UNITS: Record<UnitName, UnitInfo> = {
  F: { plural: 'farads', symbol: 'F', mathjs: 'F' },
  H: { plural: 'henries', symbol: 'H', mathjs: 'H' },
  ohm: { plural: 'ohms', symbol: 'Ω', mathjs: 'ohm' },
  Hz: { plural: 'hertz', symbol: 'Hz', mathjs: 'Hz' },
  V: { plural: 'volts', symbol: 'V', mathjs: 'V' },
  A: { plural: 'amperes', symbol: 'A', mathjs: 'A' },
  s: { plural: 'seconds', symbol: 's', mathjs: 's' },
};

export const UNIT_NAMES = Object.keys(UNITS) as UnitName[];
