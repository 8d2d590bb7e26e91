// One sentence saying over which board a fit ran, shared by the fit verb and the report.
import type { DiagnosedBoard } from '../analysis/board-as-diagnosed.js';

export function fitBasisText(basis: DiagnosedBoard | undefined, throughFixture: boolean): string {
  const over = basis ? `Fitted over the board as diagnosed (${basis.changes.join('; ')})` : 'Fitted over the board as designed (the diagnosis blames no part)';
  return `${over}${throughFixture ? ', seen through the fixture the diagnosis fitted' : ''}.`;
}
