// Public face of the instrument layer (the fixture map has its own: fixture-map.ts).

export { TransportError, type Transport, type TransportFailure, type TransportMedium } from './transport.js';
export { SerialTransport, type SerialSettings, type Parity, type FlowControl, type DataBits, type StopBits } from './transports/serial-transport.js';
export { TcpTransport, type TcpSettings } from './transports/tcp-transport.js';
export { memoryPair, type MemoryPairOptions } from './transports/memory-pair.js';
export { parseAddress, type InstrumentAddress } from './transports/address.js';
export { ScpiSession, type SessionOptions, type SessionNotice, type QueryOptions } from './scpi-session.js';
export { TERMINATORS, type Terminator } from './terminators.js';
export { LineSplitter, splitLines } from './line-splitter.js';
export { INVALID, readComplex, readFlags, readInteger, readNumber, readNumbers, readValue, numericForm, type Complex, type Invalid, type Reading, type ComplexForm } from './answers.js';
export { parseIdentity, type Identity } from './identity.js';
export { parseErrorEntry, formatErrorEntries, type ErrorEntry } from './error-queue.js';
export { AnswerError, InstrumentError, InstrumentSettingError, LimitError } from './instrument-errors.js';
export { builtinProfile, builtinProfileNames, loadProfile, matchesIdentity, parseProfileText, profileFrom, ProfileError, BUILTIN_PROFILE_DIR } from './profile.js';
export type { AnalyzerProfile, InstrumentProfile, SwitchProfile, AnalyzerFunction } from './profile-types.js';
export { analyzerDriver, type AnalyzerDriver } from './analyzer-driver.js';
export { switchDriver, type SwitchDriver } from './switch-driver.js';
export type { DriverOptions } from './driver-support.js';
export { sessionFor, sessionOptionsFor, transportFor } from './connect.js';
export { listSerialPorts, scanDevicePorts, type PortEntry, type PortListing } from './port-list.js';
