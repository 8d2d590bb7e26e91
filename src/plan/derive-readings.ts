// Which readings a plan takes, and at which frequencies, from the chosen modes:
//   profile    every node to ground at each mode frequency (modes closer than PROFILE_MERGE share one);
//   sweep      the adaptive grid (adaptive-grid.ts) over the sweep windows at the nodes where a mode is
//              largest (|amplitude| at least SWEEP_SHARE of that mode's largest, at most MAX_SWEEP_NODES);
//   reference  the same grid at REFERENCE_NODES bulk nodes: those nearest the middle of the board that
//              are not swept, the ones the modes touch least first;
//   neighbour  (optional) two-point readings across every part between two nodes, at the mode frequencies;
//   transfer   (optional) drive the largest node of each mode frequency's leading mode, sense every node:
//              the profile with its sign.
import { GROUND, type Board } from '../board/types.js';
import type { GroundedLaplacian } from '../circuit/laplacian.js';
import { ImpedanceSolver } from '../circuit/impedance.js';
import type { Mode } from '../predict/modes.js';
import type { FrequencyWindow } from '../predict/tolerance-mode-window.js';
import type { Reading } from '../predict/tolerance-readings.js';
import { adaptiveGrid, type GridOptions } from './adaptive-grid.js';
import { sweepWindows } from './sweep-windows.js';
import type { StepPurpose } from './types.js';

export const PROFILE_MERGE = 1e-3;
export const SWEEP_SHARE = 0.5;
export const MAX_SWEEP_NODES = 8;
export const REFERENCE_NODES = 2;

export interface PlannedReading {
  purpose: StepPurpose;
  reading: Reading;
  frequencies: number[];
}

export interface ReadingSet {
  readings: PlannedReading[];
  /** One frequency per group of modes closer than PROFILE_MERGE, ascending. */
  profileFrequencies: number[];
  sweepNodes: string[];
  referenceNodes: string[];
  windows: FrequencyWindow[];
  grid: number[];
}

export interface ReadingOptions {
  neighbours: boolean;
  transfer: boolean;
  grid: GridOptions;
}

export function deriveReadings(board: Board, laplacian: GroundedLaplacian, modes: readonly Mode[], options: ReadingOptions): ReadingSet {
  const nodes = laplacian.index.names;
  const groups = groupModes(modes);
  const profileFrequencies = groups.map((g) => g.frequency);
  const sweepNodes = largestNodes(nodes, modes);
  const referenceNodes = bulkNodes(board, modes, new Set(sweepNodes));
  const windows = sweepWindows(laplacian, modes);
  const swept = [...sweepNodes, ...referenceNodes];
  const solver = new ImpedanceSolver(laplacian);
  const grid = swept.length === 0 ? [] : adaptiveGrid(windows, profileFrequencies, (f) => {
    const solved = solver.at(f);
    return swept.map((node) => solved.toGround(node));
  }, options.grid);

  const readings: PlannedReading[] = [];
  for (const hi of nodes) readings.push({ purpose: 'profile', reading: { kind: 'to-ground', hi, lo: GROUND }, frequencies: [...profileFrequencies] });
  for (const hi of sweepNodes) readings.push({ purpose: 'sweep', reading: { kind: 'to-ground', hi, lo: GROUND }, frequencies: [...grid] });
  for (const hi of referenceNodes) readings.push({ purpose: 'reference', reading: { kind: 'to-ground', hi, lo: GROUND }, frequencies: [...grid] });
  if (options.neighbours) {
    for (const [hi, lo] of neighbourPairs(board, laplacian)) readings.push({ purpose: 'neighbour', reading: { kind: 'two-point', hi, lo }, frequencies: [...profileFrequencies] });
  }
  if (options.transfer) {
    const drives = new Map<string, number[]>();
    for (const g of groups) drives.set(g.peak, [...(drives.get(g.peak) ?? []), g.frequency]);
    for (const [hi, frequencies] of drives) {
      for (const sense of nodes) readings.push({ purpose: 'transfer', reading: { kind: 'transfer', hi, lo: GROUND, sense }, frequencies: [...frequencies].sort((a, b) => a - b) });
    }
  }
  return { readings, profileFrequencies, sweepNodes, referenceNodes, windows, grid };
}

interface ModeGroup {
  frequency: number;
  /** Node of largest |amplitude| of the group's most localized mode. */
  peak: string;
}

function groupModes(modes: readonly Mode[]): ModeGroup[] {
  const sorted = [...modes].sort((a, b) => a.frequency_hz - b.frequency_hz);
  const groups: Mode[][] = [];
  for (const m of sorted) {
    const last = groups[groups.length - 1];
    if (last && m.frequency_hz - last[0].frequency_hz <= PROFILE_MERGE * last[0].frequency_hz) last.push(m);
    else groups.push([m]);
  }
  return groups.map((group) => {
    const lead = group.reduce((best, m) => (m.localization > best.localization ? m : best));
    return { frequency: lead.frequency_hz, peak: peakNode(lead) };
  });
}

function peakNode(mode: Mode): string {
  let best = '';
  let size = -1;
  for (const [node, v] of Object.entries(mode.profile)) {
    if (Math.abs(v) > size) {
      best = node;
      size = Math.abs(v);
    }
  }
  return best;
}

/** Nodes where some mode is large, in board order, the largest kept when there are too many. */
function largestNodes(nodes: readonly string[], modes: readonly Mode[]): string[] {
  const share = new Map<string, number>();
  for (const m of modes) {
    const top = Math.max(...Object.values(m.profile).map(Math.abs));
    if (!(top > 0)) continue;
    for (const [node, v] of Object.entries(m.profile)) {
      const s = Math.abs(v) / top;
      if (s >= SWEEP_SHARE) share.set(node, Math.max(share.get(node) ?? 0, s));
    }
  }
  const kept = new Set([...share.entries()].sort((a, b) => b[1] - a[1]).slice(0, MAX_SWEEP_NODES).map(([n]) => n));
  return nodes.filter((n) => kept.has(n));
}

/** Bulk nodes: nearest the centroid of the board's node positions, least touched by the modes first. */
function bulkNodes(board: Board, modes: readonly Mode[], exclude: ReadonlySet<string>): string[] {
  const count = board.nodes.length;
  if (count === 0) return [];
  const centre = [0, 1, 2].map((d) => board.nodes.reduce((s, n) => s + n.position[d], 0) / count);
  const weight = (node: string) => modes.reduce((s, m) => s + (m.profile[node] ?? 0) ** 2, 0);
  const distance = (p: readonly number[]) => Math.hypot(p[0] - centre[0], p[1] - centre[1], p[2] - centre[2]);
  return board.nodes
    .map((n, order) => ({ name: n.name, d: distance(n.position), w: weight(n.name), order }))
    .filter((n) => !exclude.has(n.name))
    .sort((a, b) => roughly(a.d, b.d) || a.w - b.w || a.order - b.order)
    .slice(0, REFERENCE_NODES)
    .sort((a, b) => a.order - b.order)
    .map((n) => n.name);
}

/** Distances equal to within round-off compare as equal. */
function roughly(a: number, b: number): number {
  return Math.abs(a - b) <= 1e-9 * Math.max(1, Math.abs(a), Math.abs(b)) ? 0 : a - b;
}

/** Node pairs joined by at least one part, each once, the earlier node in board order first. */
function neighbourPairs(board: Board, laplacian: GroundedLaplacian): [string, string][] {
  const seen = new Set<string>();
  const pairs: [string, string][] = [];
  for (const part of board.parts) {
    const [a, b] = part.nodes;
    if (a === GROUND || b === GROUND) continue;
    const [hi, lo] = laplacian.index.row(a) < laplacian.index.row(b) ? [a, b] : [b, a];
    const key = `${hi}\u0000${lo}`;
    if (seen.has(key)) continue;
    seen.add(key);
    pairs.push([hi, lo]);
  }
  return pairs;
}
