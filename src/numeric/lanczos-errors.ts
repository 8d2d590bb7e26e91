// Typed failures of the shift-invert Lanczos mode solver, so callers can say what went wrong and what to try.

/** The iteration budget ran out before the wanted modes met the residual tolerance. */
export class ModesNotConvergedError extends Error {
  constructor(
    /** Wanted modes whose Ritz estimate met the tolerance when the budget ran out. */
    readonly converged: number,
    readonly wanted: number,
    readonly restarts: number,
    readonly tolerance: number,
  ) {
    super(
      `shift-invert Lanczos: ${converged} of ${wanted} modes converged to a relative residual of ` +
        `${tolerance.toExponential(0)} after ${restarts} restarts; raise the restart budget or the subspace size`,
    );
    this.name = 'ModesNotConvergedError';
  }
}

/**
 * K − σC stayed singular for every shift tried: some direction has neither capacitance nor inductance
 * coupling it to the rest (e.g. an island joined to the board by resistors only), so the lossless pencil
 * is singular there whatever the frequency.
 */
export class SingularPencilError extends Error {
  constructor(
    /** Original index of the column with no usable pivot at the last shift tried. */
    readonly index: number,
    /** The shifts σ (rad²/s²) that were tried, in order. */
    readonly shifts: readonly number[],
  ) {
    super(
      `K − σC is singular at column ${index} for every shift tried (${shifts.length}); the lossless pencil ` +
        'has a direction with neither capacitance nor inductance',
    );
    this.name = 'SingularPencilError';
  }
}
