// Node names as written in files. Ground may be spelt gnd, GND, Gnd, ground, GROUND (any letter case):
// people write all of these, and mistaking one for an ordinary node would leave the board floating.

import { GROUND } from './types.js';

const GROUND_SPELLINGS = new Set(['gnd', 'ground']);

export function isGroundName(name: string): boolean {
  return GROUND_SPELLINGS.has(name.toLowerCase());
}

/** The node name to use, with every spelling of ground mapped to GROUND; or a problem text. */
export function readNodeName(raw: string | number): { name: string } | { problem: string } {
  const name = String(raw).trim();
  if (name === '') return { problem: 'a node name must not be empty' };
  if (/\s/.test(name)) return { problem: `node name ${JSON.stringify(name)} contains white space` };
  // Plans, fixture maps and mode profiles key plain objects by node name; this one would change the object.
  if (name === '__proto__') return { problem: 'node name "__proto__" is reserved; choose another name' };
  return { name: isGroundName(name) ? GROUND : name };
}

/**
 * Node name templates for lattices. Placeholders: {site}, {i} {j} {k} (cell index along axes 1..3,
 * counted from 0) and {index} (running number of the node in cell-major order, counted from 1).
 */
export const TEMPLATE_PLACEHOLDERS = ['site', 'i', 'j', 'k', 'index'] as const;

export function defaultNameTemplate(dimensions: number): string {
  return ['{site}{i}', '{site}{i}_{j}', '{site}{i}_{j}_{k}'][dimensions - 1];
}

/** Problems with a template: unknown placeholders, or axes the lattice does not have. */
export function templateProblems(template: string, dimensions: number): string[] {
  const problems: string[] = [];
  for (const match of template.matchAll(/\{([^}]*)\}/g)) {
    const key = match[1];
    const axis = ['i', 'j', 'k'].indexOf(key);
    if (!(TEMPLATE_PLACEHOLDERS as readonly string[]).includes(key)) {
      problems.push(`unknown placeholder {${key}}; use {site}, {i}, {j}, {k} or {index}`);
    } else if (axis >= dimensions) {
      problems.push(`placeholder {${key}} needs a lattice of ${axis + 1} dimensions, this one has ${dimensions}`);
    }
  }
  if (/\s/.test(template)) problems.push('node names made from it would contain white space');
  if (template === '__proto__') problems.push('node name "__proto__" is reserved; choose another name');
  return problems;
}

export function fillTemplate(template: string, site: string, cell: readonly number[], index: number): string {
  return template.replace(/\{(site|i|j|k|index)\}/g, (_, key: string) => {
    if (key === 'site') return site;
    if (key === 'index') return String(index);
    return String(cell['ijk'.indexOf(key)]);
  });
}
