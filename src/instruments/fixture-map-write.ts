// Writes the map in use to a file (YAML, or JSON for a .json name), so a dry run against the simulated
// bench leaves behind the wiring it assumed and the same file can be given to a later run.
import { writeFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { Document, isMap, isPair, isScalar, visit } from 'yaml';
import { FixtureMapError } from './fixture-map-error.js';
import type { FixtureMap } from './fixture-map-model.js';

const HEADER = [
  '# Fixture map: which switch-matrix channel joins which node to which analyzer bus.',
  '# Closing "hi" of a node joins it to the HI bus, "lo" to the LO bus, "sense" to the SENSE bus;',
  '# gnd holds the channels of the board ground.',
];

/** The map as file text: YAML with a short header, or JSON. */
export function fixtureMapText(map: FixtureMap, format: 'yaml' | 'json' = 'yaml'): string {
  const data = { description: `written from ${map.source}`, ...map.toData() };
  if (format === 'json') return `${JSON.stringify(data, null, 2)}\n`;
  const doc = new Document(data);
  // One line per node ("n1: { hi: 1001, lo: 2001, sense: 3001 }") keeps a 999-node map readable.
  visit(doc, {
    Pair(_, pair) {
      if (isPair(pair) && isScalar(pair.key) && pair.key.value === 'gnd' && isMap(pair.value)) pair.value.flow = true;
    },
    Map(_, map, path) {
      if (path.length >= 4) map.flow = true;
    },
  });
  return `${HEADER.join('\n')}\n${doc.toString()}`;
}

/** Writes the map to `path` and returns the absolute path written. Throws FixtureMapError naming the file. */
export function writeFixtureMap(map: FixtureMap, path: string): string {
  const format = path.toLowerCase().endsWith('.json') ? 'json' : 'yaml';
  const absolute = resolve(path);
  try {
    writeFileSync(absolute, fixtureMapText(map, format), 'utf8');
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    const reason = code === 'ENOENT' ? 'no such folder' : code === 'EACCES' || code === 'EPERM' ? 'permission denied' : code === 'EISDIR' ? 'is a directory' : code === 'ENOTDIR' ? 'a part of the path is a file, not a folder' : String((error as Error).message ?? error);
    throw new FixtureMapError([{ file: path, path: '', message: `cannot write the fixture map: ${reason}` }]);
  }
  return absolute;
}
