// The simulated impedance analyzer: a sine source between its HI and LO buses, a current measurement, and a
// SENSe input for transfer readings. Readings come from an injected MeasurementSource (the bench physics);
// this module owns only the settings, the measurement timing and the answer formats.
//
// Timing: a measurement takes (baseTimeMs + averages x perAverageMs) x timeScale. INITiate is overlapped: it
// returns at once and *OPC?, *WAI and FETCh? wait for the measurement. READ? is INITiate followed by FETCh?.

import { ScpiInstrument } from './scpi-instrument.js';
import type { MeasurementReading, MeasurementRequest, MeasurementSource } from './measurement-source.js';
import type { CommandSpec } from './scpi/command-tree.js';
import type { NumericSpec } from './scpi/parameters.js';
import { delay } from './scpi/delay.js';
import { nr1, nr3 } from './scpi/response-format.js';
import { ScpiDevice } from './scpi/scpi-device.js';
import { ScpiError } from './scpi/scpi-error.js';
import { VERSION } from '../src/version.js';

export interface AnalyzerOptions {
  source: MeasurementSource;
  serial?: string;
  /** Multiplies every simulated duration; 0 makes measurements instantaneous (tests). Default 1. */
  timeScale?: number;
  /** Fixed part of a measurement in ms; default 20. */
  baseTimeMs?: number;
  /** Time per average in ms; default 5. */
  perAverageMs?: number;
  /** |Z| above this (ohms, or V/A for transfer) reads as overload; default 1 GΩ. */
  overloadAboveOhm?: number;
  errorQueueSize?: number;
}

export const FREQUENCY: NumericSpec = { kind: 'numeric', name: 'the frequency', unit: 'HZ', min: 10, max: 10e6, default: 1e3 };
export const LEVEL: NumericSpec = { kind: 'numeric', name: 'the level', unit: 'V', min: 5e-3, max: 1, default: 0.1 };
export const AVERAGES: NumericSpec = { kind: 'numeric', name: 'the average count', min: 1, max: 256, default: 1, integer: true };

/** SCPI's overload answer (9.9E37, common practice), for both fields in either format. */
export const OVERLOAD_ANSWER = '9.9E37,9.9E37';

type FunctionName = 'IMPedance' | 'TRANsfer';
type FormatName = 'RECTangular' | 'POLar';

interface Settings {
  frequencyHz: number;
  level: number;
  function: FunctionName;
  averages: number;
  format: FormatName;
}

const RESET_SETTINGS: Settings = { frequencyHz: FREQUENCY.default, level: LEVEL.default, function: 'IMPedance', averages: AVERAGES.default, format: 'RECTangular' };

interface Running {
  done: Promise<void>;
  cancel(): void;
}

export class SimulatedAnalyzer extends ScpiInstrument {
  protected readonly scpi: ScpiDevice;
  private readonly source: MeasurementSource;
  private readonly timeScale: number;
  private readonly baseTimeMs: number;
  private readonly perAverageMs: number;
  private readonly overloadAboveOhm: number;
  private settings: Settings = { ...RESET_SETTINGS };
  private running?: Running;
  private last?: MeasurementReading;

  constructor(options: AnalyzerOptions) {
    super();
    this.source = options.source;
    this.timeScale = nonNegative('timeScale', options.timeScale ?? 1);
    this.baseTimeMs = nonNegative('baseTimeMs', options.baseTimeMs ?? 20);
    this.perAverageMs = nonNegative('perAverageMs', options.perAverageMs ?? 5);
    this.overloadAboveOhm = options.overloadAboveOhm ?? 1e9;
    if (!(this.overloadAboveOhm > 0)) throw new RangeError(`analyzer: overloadAboveOhm must be > 0, got ${this.overloadAboveOhm}`);
    this.scpi = new ScpiDevice(
      {
        identity: `Topoprobe Lab,SIM-ZA100,${options.serial ?? 'ZA0001'},${VERSION}`,
        commands: this.commands(),
        resetSettings: () => this.resetSettings(),
      },
      { errorQueueSize: options.errorQueueSize },
    );
  }

  /** The duration of one measurement with the present settings, in ms of real time. */
  measurementTimeMs(): number {
    return (this.baseTimeMs + this.settings.averages * this.perAverageMs) * this.timeScale;
  }

  private resetSettings(): void {
    this.running?.cancel();
    this.running = undefined;
    this.last = undefined;
    this.settings = { ...RESET_SETTINGS };
  }

  private commands(): CommandSpec[] {
    return [
      numericSetting('[SOURce#:]FREQuency[:CW]', FREQUENCY, nr3, () => this.settings.frequencyHz, (v) => (this.settings.frequencyHz = v)),
      numericSetting('[SOURce#:]VOLTage[:LEVel]', LEVEL, nr3, () => this.settings.level, (v) => (this.settings.level = v)),
      numericSetting('[SENSe#:]AVERage[:COUNt]', AVERAGES, nr1, () => this.settings.averages, (v) => (this.settings.averages = v)),
      {
        header: '[SENSe#:]FUNCtion',
        set: { params: [{ kind: 'choice', name: 'the function', choices: ['IMPedance', 'TRANsfer'] }], run: (c) => void (this.settings.function = c.choice(0) as FunctionName) },
        // Character responses are the short form in upper case (SCPI-99 vol. 1, 8.3 (from memory)).
        query: { run: () => this.settings.function.replace(/[a-z]+$/, '') },
      },
      {
        header: 'FORMat[:ZDATa]',
        set: { params: [{ kind: 'choice', name: 'the format', choices: ['RECTangular', 'POLar'] }], run: (c) => void (this.settings.format = c.choice(0) as FormatName) },
        query: { run: () => this.settings.format.replace(/[a-z]+$/, '') },
      },
      { header: 'INITiate[:IMMediate]', set: { run: (c) => this.initiate(c.header) } },
      { header: 'FETCh', query: { run: (c) => this.fetch(c.header) } },
      {
        header: 'READ',
        query: {
          run: async (c) => {
            if (this.running) await this.running.done;
            this.initiate(c.header);
            return this.fetch(c.header);
          },
        },
      },
    ];
  }

  private initiate(header: string): void {
    if (this.running) throw new ScpiError(-213, `${header}: a measurement is already running`);
    const s = this.settings;
    const request: MeasurementRequest = { frequencyHz: s.frequencyHz, level: s.level, function: s.function === 'IMPedance' ? 'impedance' : 'transfer', averages: s.averages };
    this.last = undefined;
    const duration = this.measurementTimeMs();
    if (duration === 0) {
      this.last = this.take(request);
      return;
    }
    let cancelled = false;
    let finish: () => void = () => undefined;
    const done = new Promise<void>((resolve) => {
      finish = resolve;
      void delay(duration).then(() => {
        if (!cancelled) this.last = this.take(request);
        resolve();
      });
    });
    const running: Running = {
      done,
      cancel: () => {
        cancelled = true;
        finish();
      },
    };
    this.running = running;
    void done.then(() => {
      if (this.running === running) this.running = undefined;
    });
    this.scpi.overlap(done);
  }

  /** One reading from the physics, with the analyzer's own overload detection on top. */
  private take(request: MeasurementRequest): MeasurementReading | undefined {
    let reading: MeasurementReading;
    try {
      reading = this.source.measure(request);
    } catch (error) {
      this.scpi.injectError(-200, `measurement failed: ${error instanceof Error ? error.message : String(error)}`);
      return undefined;
    }
    if (reading === 'overload') return reading;
    const { re, im } = reading;
    if (!Number.isFinite(re) || !Number.isFinite(im) || Math.hypot(re, im) > this.overloadAboveOhm) return 'overload';
    return { re, im };
  }

  private async fetch(header: string): Promise<string> {
    if (this.running) await this.running.done;
    const reading = this.last;
    if (reading === undefined) throw new ScpiError(-200, `${header}: no measurement to fetch; send INIT or READ? first`);
    if (reading === 'overload') return OVERLOAD_ANSWER;
    if (this.settings.format === 'RECTangular') return `${nr3(reading.re)},${nr3(reading.im)}`;
    const phaseDeg = (Math.atan2(reading.im, reading.re) * 180) / Math.PI;
    return `${nr3(Math.hypot(reading.re, reading.im))},${nr3(phaseDeg)}`;
  }
}

/** A numeric setting with its query, which also answers `? MIN`, `? MAX` and `? DEF` (SCPI-99 (from memory)). */
function numericSetting(header: string, spec: NumericSpec, format: (v: number) => string, get: () => number, set: (v: number) => void): CommandSpec {
  return {
    header,
    set: { params: [spec], run: (c) => set(c.number(0)) },
    query: {
      params: [{ kind: 'limit', name: 'MIN, MAX or DEF', optional: true }],
      run: (c) => {
        const limit = c.limit(0);
        return format(limit === undefined ? get() : { MIN: spec.min, MAX: spec.max, DEF: spec.default }[limit]);
      },
    },
  };
}

function nonNegative(name: string, value: number): number {
  if (!(value >= 0) || !Number.isFinite(value)) throw new RangeError(`analyzer: ${name} must be a finite value >= 0, got ${value}`);
  return value;
}
