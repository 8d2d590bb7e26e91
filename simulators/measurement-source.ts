// Where the simulated analyzer's readings come from: the bench physics computes them from the board as built
// and the switch matrix's contacts. The analyzer knows nothing else about the bench.

export interface MeasurementSource {
  measure(request: { frequencyHz: number; level: number; function: 'impedance' | 'transfer'; averages: number }): { re: number; im: number } | 'overload';
}

export type MeasurementRequest = Parameters<MeasurementSource['measure']>[0];
export type MeasurementReading = ReturnType<MeasurementSource['measure']>;
