// Checks that the parts of a report belong together before anything is drawn, so a mismatched log and
// board give one clear line instead of a silently wrong picture.
import { GROUND } from '../board/types.js';
import type { ReportInput } from './report-input.js';
import { ReportError } from './report-error.js';

export function checkReportInput(input: ReportInput): void {
  const board = input.board;
  const nodes = new Set(board.nodes.map((n) => n.name));
  const known = (name: string) => name === GROUND || nodes.has(name);
  if (board.nodes.length === 0) throw new ReportError(`board ${board.name}: has no nodes to draw`);
  for (const n of board.nodes) {
    if (!n.position.every(Number.isFinite)) throw new ReportError(`board ${board.name}: node ${n.name} has a position that is not three finite numbers`);
  }
  for (const r of input.readings) {
    const at = `reading step ${r.step} point ${r.point}`;
    if (!(r.frequency_hz > 0) || !Number.isFinite(r.frequency_hz)) throw new ReportError(`${at}: frequency_hz ${r.frequency_hz} is not a positive number`);
    for (const [field, name] of [['hi', r.hi], ['lo', r.lo], ['sense', r.sense]] as const) {
      if (name !== undefined && !known(name)) throw new ReportError(`${at}: ${field} names node ${JSON.stringify(name)}, which board ${board.name} does not have`);
    }
    if (r.kind === 'transfer' && r.sense === undefined) throw new ReportError(`${at}: a transfer reading without a sense node`);
    if (!Number.isFinite(r.pred_re) || !Number.isFinite(r.pred_im)) throw new ReportError(`${at}: pred_re/pred_im are not finite numbers`);
  }
  (input.bands ?? []).forEach((b, i) => {
    if (!(b.mag_hi_ohm >= b.mag_lo_ohm)) throw new ReportError(`bands[${i}] (step ${b.step} point ${b.point}): mag_hi_ohm ${b.mag_hi_ohm} is below mag_lo_ohm ${b.mag_lo_ohm}`);
  });
  (input.modes ?? []).forEach((m, i) => {
    if (!(m.frequency_hz > 0) || !Number.isFinite(m.frequency_hz)) throw new ReportError(`modes[${i}]: frequency_hz ${m.frequency_hz} is not a positive number`);
  });
}
