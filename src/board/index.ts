// Public face of the board module.

export { loadBoard, parseBoardText } from './load.js';
export { BoardError, formatProblem, type Problem } from './errors.js';
export * from './types.js';
