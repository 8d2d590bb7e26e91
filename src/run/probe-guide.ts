// Operator-probed mode: no switch matrix, a person moves the HI, LO (and SENSE) probes. The runner asks for
// each placement on stderr and waits for Enter on stdin before it measures; the excitation is at its
// minimum whenever the probes move.
import { createInterface, type Interface } from 'node:readline';
import type { Readable, Writable } from 'node:stream';
import type { PlanStep } from '../plan/types.js';
import type { StopSignal } from './stop-signal.js';

export interface ProbeGuide {
  /** Resolves once the probes sit where `step` needs them; rejects with OperatorGone when nobody answers. */
  place(step: PlanStep, stop: StopSignal): Promise<void>;
  /** At the end: the excitation is at its minimum and the probes may come off. */
  release(): Promise<void>;
  close(): void;
}

/** stdin ended while the runner waited for the operator. */
export class OperatorGone extends Error {
  constructor() {
    super('stdin closed while waiting for the operator to press Enter');
    this.name = 'OperatorGone';
  }
}

export function placementText(step: PlanStep): string {
  const sense = step.sense !== undefined ? `, SENSE to ${step.sense}` : '';
  return `HI to ${step.hi}, LO to ${step.lo}${sense}`;
}

/** What happens on the bench once the operator has answered: nothing on a real bench, the probes in a simulation. */
export interface ProbeHands {
  placed(step: PlanStep): Promise<void> | void;
  released(): Promise<void> | void;
}

/** Asks on `prompts` (stderr), reads Enter from `answers` (stdin). */
export function operatorPrompt(answers: Readable, prompts: Writable, hands?: ProbeHands): ProbeGuide {
  let lines: Interface | undefined;
  const queued: string[] = [];
  const waiting: { resolve(): void; reject(e: Error): void }[] = [];
  let ended = false;
  const open = () => {
    if (lines) return;
    lines = createInterface({ input: answers, terminal: false });
    lines.on('line', (line) => {
      const w = waiting.shift();
      if (w) w.resolve();
      else queued.push(line);
    });
    lines.on('close', () => {
      ended = true;
      for (const w of waiting.splice(0)) w.reject(new OperatorGone());
    });
  };
  const enter = (stop: StopSignal) =>
    new Promise<void>((resolve, reject) => {
      if (queued.length > 0) {
        queued.shift();
        return resolve();
      }
      if (ended) return reject(new OperatorGone());
      const entry = { resolve, reject };
      waiting.push(entry);
      // A stop while waiting ends the wait at once; the runner sees the stop and reads nothing more.
      const sub = stop.requested$.subscribe(() => {
        const i = waiting.indexOf(entry);
        if (i >= 0) waiting.splice(i, 1);
        resolve();
      });
      const done = () => sub.unsubscribe();
      entry.resolve = () => (done(), resolve());
      entry.reject = (e) => (done(), reject(e));
    });
  return {
    async place(step, stop) {
      open();
      prompts.write(`step ${step.step}: put ${placementText(step)}, then press Enter\n`);
      await enter(stop);
      if (!stop.requested) await hands?.placed(step);
    },
    async release() {
      await hands?.released();
      prompts.write('the excitation is at its minimum: the probes may come off\n');
    },
    close() {
      lines?.close();
      lines = undefined;
    },
  };
}
