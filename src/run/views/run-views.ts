// Where a run's events are shown. On a terminal: a progress bar on stderr with the time left and the
// counts of deviations and invalid readings, with deviations and warnings printed above it. Elsewhere:
// those lines alone. With --json: one JSON line per event on stdout and nothing else there.
import cliProgress from 'cli-progress';
import type { Writable } from 'node:stream';
import type { RunEvent } from '../run-events.js';
import { deviationText, invalidText, summaryText, warningText } from './event-text.js';

export interface RunView {
  show(event: RunEvent): void;
  /** A message outside the event stream ("stopping safely…"). */
  say(text: string): void;
  close(): void;
}

export function jsonView(out: Writable, err: Writable): RunView {
  return {
    show: (event) => void out.write(JSON.stringify(event) + '\n'),
    say: (text) => void err.write(`${text}\n`),
    close: () => undefined,
  };
}

/** Plain lines on `err`, the summary on `out`: for logs and pipes. */
export function lineView(out: Writable, err: Writable, logFile: string): RunView {
  return {
    show(event) {
      const line = textFor(event);
      if (line !== undefined) err.write(`${line}\n`);
      if (event.event === 'done') out.write(`${summaryText(event, logFile)}\n`);
    },
    say: (text) => void err.write(`${text}\n`),
    close: () => undefined,
  };
}

export function progressView(out: Writable, err: NodeJS.WritableStream, logFile: string, before: { deviations: number; invalid: number } = { deviations: 0, invalid: 0 }): RunView {
  const bars = new cliProgress.MultiBar(
    {
      stream: err,
      format: 'scan {bar} {value}/{total} readings | {deviations} deviations, {invalid} invalid | {eta_formatted} left',
      hideCursor: true,
      clearOnComplete: false,
      etaBuffer: 50,
      fps: 8,
    },
    cliProgress.Presets.shades_classic,
  );
  let bar: cliProgress.SingleBar | undefined;
  const counts = { ...before };
  const above = (text: string) => (bar ? bars.log(`${text}\n`) : err.write(`${text}\n`));
  return {
    show(event) {
      if (event.event === 'started') {
        bar = bars.create(event.readings_total, event.readings_done, counts);
        return;
      }
      if (event.event === 'reading') {
        if (event.flag === 'deviation') counts.deviations++;
        if (event.flag === 'invalid') counts.invalid++;
        bar?.increment(1, counts);
      }
      const line = textFor(event);
      if (line !== undefined) above(line);
      if (event.event === 'done') {
        bars.stop();
        bar = undefined;
        out.write(`${summaryText(event, logFile)}\n`);
      }
    },
    say: (text) => above(text),
    close: () => bars.stop(),
  };
}

function textFor(event: RunEvent): string | undefined {
  switch (event.event) {
    case 'deviation':
      return deviationText(event);
    case 'reading':
      return event.flag === 'invalid' ? invalidText(event) : undefined;
    case 'warning':
      return warningText(event);
    default:
      return undefined;
  }
}
