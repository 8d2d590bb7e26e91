// The physics side's view of the analyzer/physics interface, declared in measurement-source.ts.
export type { MeasurementRequest, MeasurementSource } from './measurement-source.js';
