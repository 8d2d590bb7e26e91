// Why a plan is not written. Both are bad input (exit code 2) told in one line: a limit the bench or a
// part would be taken past, or a board and options that give nothing to plan.
export class PlanLimitError extends Error {
  readonly exitCode = 2;
  constructor(message: string) {
    super(message);
    this.name = 'PlanLimitError';
  }
}

export class PlanDerivationError extends Error {
  readonly exitCode = 2;
  constructor(message: string) {
    super(message);
    this.name = 'PlanDerivationError';
  }
}
