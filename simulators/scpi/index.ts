// The SCPI layer the simulated instruments are built on.

export { buildTree, resolveHeader, type CommandCall, type CommandSpec, type Handler, type HandlerResult, type TreeNode } from './command-tree.js';
export { SCPI_ERRORS, errorClass, standardText, type ErrorClass, type ScpiErrorCode } from './error-codes.js';
export { ErrorQueue, formatQueuedError, type QueuedError } from './error-queue.js';
export { containsQuery, lexMessage, type DataElement, type Header, type LexedMessage, type ProgramUnit } from './lexer.js';
export { convertParameters, mnemonicMatches, shortForm, type ParamSpec, type ParamValue } from './parameters.js';
export { channelList, nr1, nr3, quoted, SCPI_INFINITY, SCPI_NAN } from './response-format.js';
export { ScpiDevice, type InstrumentSpec, type OperationTracker, type ScpiDeviceOptions } from './scpi-device.js';
export { ScpiError } from './scpi-error.js';
export { ESR, STB, StatusRegisters } from './status.js';
export { scaleDecimal, suffixExponent, type ScpiUnit } from './suffix.js';
