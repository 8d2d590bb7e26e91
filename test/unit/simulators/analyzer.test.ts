// The simulated impedance analyzer's command handling: settings and their ranges, answer formats against
// mathjs as the reference for complex magnitude and argument, overload, READ? = INIT;FETCh?, and *OPC?
// waiting for a running measurement.

import { abs, arg, complex } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { OVERLOAD_ANSWER, SimulatedAnalyzer } from '../../../simulators/analyzer.js';
import type { MeasurementReading, MeasurementRequest } from '../../../simulators/measurement-source.js';

/** A source that records every request and answers from a list (the last one repeats). */
function recordingSource(readings: MeasurementReading[]) {
  const requests: MeasurementRequest[] = [];
  return {
    requests,
    measure(request: MeasurementRequest): MeasurementReading {
      requests.push(request);
      return readings[Math.min(requests.length - 1, readings.length - 1)];
    },
  };
}

async function codes(a: SimulatedAnalyzer): Promise<number[]> {
  const out: number[] = [];
  for (let i = 0; i < 50; i++) {
    const code = Number((await a.receive('SYST:ERR?'))?.split(',')[0]);
    if (code === 0) return out;
    out.push(code);
  }
  throw new Error('the error queue never emptied');
}

describe('answer formats', () => {
  const cases = [
    { re: 12.5, im: -47.3 },
    { re: -3.2e-3, im: 1.7e4 },
    { re: 1e6, im: 0 },
    { re: -250, im: -0.5 },
  ];
  for (const z of cases) {
    it(`RECTangular and POLar agree for ${z.re}${z.im >= 0 ? '+' : ''}${z.im}j (reference: mathjs abs/arg)`, async () => {
      const a = new SimulatedAnalyzer({ source: recordingSource([z]), timeScale: 0 });
      const [re, im] = (await a.receive('FORM RECT;:READ?'))!.split(',').map(Number);
      expect([re, im]).toEqual([z.re, z.im]);
      const [magnitude, phaseDeg] = (await a.receive('FORM POL;:FETC?'))!.split(',').map(Number);
      const reference = complex(z.re, z.im);
      expect(magnitude).toBeCloseTo(abs(reference) as unknown as number, 9);
      expect(phaseDeg).toBeCloseTo(((arg(reference) as number) * 180) / Math.PI, 9);
      // And back: |Z|(cos φ, sin φ) is the rectangular answer.
      expect(magnitude * Math.cos((phaseDeg * Math.PI) / 180)).toBeCloseTo(z.re, 6);
      expect(magnitude * Math.sin((phaseDeg * Math.PI) / 180)).toBeCloseTo(z.im, 6);
    });
  }

  it('answers are NR3 with an explicit decimal point (IEEE 488.2 8.7.4 (from memory))', async () => {
    const a = new SimulatedAnalyzer({ source: recordingSource([{ re: 100, im: -3 }]), timeScale: 0 });
    expect(await a.receive('READ?')).toBe('1.0E+02,-3.0E+00');
  });

  it('overload answers 9.9E37,9.9E37 in both formats (SCPI overload convention, common practice)', async () => {
    for (const reading of ['overload', { re: 2e9, im: 0 }, { re: Number.NaN, im: 1 }, { re: 1, im: Infinity }] as MeasurementReading[]) {
      const a = new SimulatedAnalyzer({ source: recordingSource([reading]), timeScale: 0 });
      expect(await a.receive('READ?')).toBe(OVERLOAD_ANSWER);
      expect(await a.receive('FORM POL;:FETC?')).toBe('9.9E37,9.9E37');
    }
  });

  it('the overload threshold is an option', async () => {
    const a = new SimulatedAnalyzer({ source: recordingSource([{ re: 2e9, im: 0 }]), timeScale: 0, overloadAboveOhm: 1e12 });
    expect(await a.receive('READ?')).toBe('2.0E+09,0.0E+00');
  });
});

describe('settings and their ranges (-222 outside, the setting unchanged)', () => {
  const limits: [string, string, string, string][] = [
    // command, a value just inside, a value just outside, query
    ['FREQ', '10', '9.99', 'FREQ?'],
    ['FREQ', '10MHz', '10.01MHz', 'FREQ?'],
    ['VOLT', '5mV', '4.9mV', 'VOLT?'],
    ['VOLT', '1V', '1.01V', 'VOLT?'],
    ['AVER', '1', '0', 'AVER?'],
    ['AVER', '256', '257', 'AVER?'],
  ];
  for (const [command, inside, outside, query] of limits) {
    it(`${command} ${inside} is accepted, ${command} ${outside} is -222`, async () => {
      const a = new SimulatedAnalyzer({ source: recordingSource(['overload']), timeScale: 0 });
      await a.receive(`${command} ${inside}`);
      const accepted = await a.receive(query);
      await a.receive(`${command} ${outside}`);
      expect(await a.receive(query)).toBe(accepted);
      expect(await codes(a)).toEqual([-222]);
    });
  }

  it('the request to the source carries the settings; FUNCtion selects impedance or transfer', async () => {
    const source = recordingSource([{ re: 1, im: 1 }]);
    const a = new SimulatedAnalyzer({ source, timeScale: 0 });
    await a.receive('READ?');
    await a.receive('FREQ 163.4kHz;VOLT 50mV;:FUNC TRAN;AVER 8;:READ?');
    expect(source.requests).toEqual([
      { frequencyHz: 1000, level: 0.1, function: 'impedance', averages: 1 },
      { frequencyHz: 163400, level: 0.05, function: 'transfer', averages: 8 },
    ]);
  });

  it('*RST restores FREQ 1 kHz, VOLT 0.1 V, FUNC IMP, AVER 1, FORM RECT and forgets the last reading', async () => {
    const a = new SimulatedAnalyzer({ source: recordingSource([{ re: 1, im: 1 }]), timeScale: 0 });
    await a.receive('FREQ 2k;VOLT 0.5;:FUNC TRAN;AVER 4;:FORM POL;:READ?');
    await a.receive('*RST');
    expect(await a.receive('FREQ?;VOLT?;:FUNC?;AVER?;:FORM?')).toBe('1.0E+03;1.0E-01;IMP;1;RECT');
    expect(await a.receive('FETC?')).toBeUndefined();
    expect(await codes(a)).toEqual([-200]);
  });
});

describe('measurements', () => {
  it('READ? is INIT;FETCh?: each takes one new measurement and answers it', async () => {
    const source = recordingSource([{ re: 1, im: 0 }, { re: 2, im: 0 }, { re: 3, im: 0 }]);
    const a = new SimulatedAnalyzer({ source, timeScale: 0 });
    expect(await a.receive('READ?')).toBe('1.0E+00,0.0E+00');
    expect(await a.receive('INIT;FETC?')).toBe('2.0E+00,0.0E+00');
    expect(await a.receive('FETC?')).toBe('2.0E+00,0.0E+00'); // FETCh? alone measures nothing new
    expect(await a.receive('READ?')).toBe('3.0E+00,0.0E+00');
    expect(source.requests).toHaveLength(3);
  });

  it('FETCh? before any measurement is -200 and answers nothing', async () => {
    const a = new SimulatedAnalyzer({ source: recordingSource([{ re: 1, im: 0 }]), timeScale: 0 });
    expect(await a.receive('FETC?')).toBeUndefined();
    expect(await codes(a)).toEqual([-200]);
  });

  it('*OPC? waits for a running measurement: the source has been read when it answers', async () => {
    const source = recordingSource([{ re: 7, im: 0 }]);
    const a = new SimulatedAnalyzer({ source, baseTimeMs: 2, perAverageMs: 1, timeScale: 1 });
    await a.receive('AVER 3;INIT');
    expect(source.requests).toHaveLength(0); // still integrating
    expect(await a.receive('*OPC?')).toBe('1');
    expect(source.requests).toHaveLength(1);
    expect(await a.receive('FETC?')).toBe('7.0E+00,0.0E+00');
  });

  it('FETCh? and *WAI wait for the running measurement too', async () => {
    const source = recordingSource([{ re: 8, im: 0 }]);
    const a = new SimulatedAnalyzer({ source, baseTimeMs: 2, perAverageMs: 0, timeScale: 1 });
    expect(await a.receive('INIT;FETC?')).toBe('8.0E+00,0.0E+00');
    await a.receive('INIT;*WAI');
    expect(source.requests).toHaveLength(2);
  });

  it('the measurement time is (base + averages x per-average) x timeScale', async () => {
    const a = new SimulatedAnalyzer({ source: recordingSource(['overload']), baseTimeMs: 20, perAverageMs: 5, timeScale: 0.5 });
    await a.receive('AVER 16');
    expect(a.measurementTimeMs()).toBe((20 + 16 * 5) * 0.5);
    expect(new SimulatedAnalyzer({ source: recordingSource(['overload']), timeScale: 0 }).measurementTimeMs()).toBe(0);
  });

  it('a source that fails gives -200 with its message, and no reading', async () => {
    const a = new SimulatedAnalyzer({
      source: {
        measure: () => {
          throw new Error('board has no node n99');
        },
      },
      timeScale: 0,
    });
    expect(await a.receive('READ?')).toBeUndefined();
    const e = await a.receive('SYST:ERR?;ERR?');
    expect(e).toBe('-200,"Execution error; measurement failed: board has no node n99";-200,"Execution error; READ?: no measurement to fetch; send INIT or READ? first"');
  });
});
