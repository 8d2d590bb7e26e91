// Public face of the fixture map: the wiring between the board's nodes and the analyzer's HI, LO and
// SENSE buses through the switch matrix. A map comes from a file (JSON or YAML) or is the default map.
export { BUSES, CHANNEL_MAX, CHANNEL_MIN, FixtureMap, type Bus, type FixtureMapData, type NodeChannels, type Terminal } from './fixture-map-model.js';
export { FixtureMapError } from './fixture-map-error.js';
export { checkMeasurable, loadFixtureMap, parseFixtureMapText, type FixtureMapCheck } from './fixture-map-read.js';
export { DEFAULT_MAP_MAX_NODES, defaultFixtureMap } from './fixture-map-default.js';
export { fixtureMapText, writeFixtureMap } from './fixture-map-write.js';
