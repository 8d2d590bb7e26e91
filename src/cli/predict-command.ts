// `topoprobe predict <board>`: predicted impedances and modes of a board, as tables or as JSON.
import { Command } from 'commander';
import { GROUND, type Board } from '../board/types.js';
import { loadBoard } from '../board/load.js';
import { GroundedLaplacian } from '../circuit/laplacian.js';
import { everyNodeToGround, predictImpedances, RESIDUAL_LIMIT, type TerminalPair } from '../predict/impedances.js';
import { predictModes, type Mode } from '../predict/modes.js';
import { NoLatticeError, predictBands, type BandPrediction } from '../predict/bands.js';
import { formatQuantity } from '../units/quantity.js';
import { UsageError } from './exit-codes.js';
import { parseCount, parseFrequency, parseFrequencyList, parseSweep } from './frequency-options.js';
import { textTable } from './text-table.js';

interface PredictOptions {
  freq?: string[];
  sweep?: string[];
  node: string[];
  pair: string[];
  modes?: string;
  near?: string;
  bands?: string | boolean;
  json?: boolean;
}

const collect = (value: string, previous: string[] = []) => [...previous, value];

export function predictCommand(): Command {
  return new Command('predict')
    .description('predict node impedances and resonant modes of a board from its parts')
    .argument('<board>', 'board file (YAML or JSON)')
    .option('--freq <list>', 'frequencies, comma separated, SI prefixes allowed (163k,170kHz,0.2MHz); repeatable', collect)
    .option('--sweep <spec>', 'START:STOP:POINTS[:log], e.g. 100k:250k:151 or 1k:1M:61:log; repeatable', collect)
    .option('--node <name>', 'node to read against ground; repeatable (default: every node)', collect, [])
    .option('--pair <hi:lo>', 'two-point impedance between two nodes, e.g. n1:n24; repeatable', collect, [])
    .option('--modes <k>', 'also list the k resonant modes of the lossless board')
    .option('--near <freq>', 'with --modes: the modes nearest this frequency (default: the most localized)')
    .option('--bands [points]', 'bulk Bloch bands of a lattice board along the customary path, with the band gaps (points per path segment, default 24)')
    .option('--json', 'print one JSON document on stdout and nothing else')
    .addHelpText(
      'after',
      `
Without --freq or --sweep the impedances are computed at the frequency of the first listed mode
(the most localized one when --modes is not given), which is where an edge or corner mode
shows as a peak of node-to-ground impedance.

Examples:
  topoprobe predict shared/boards/chain-24.yaml --modes 3 --near 160k
  topoprobe predict shared/boards/chain-24.yaml --sweep 140k:190k:101 --node n1 --node n12
  topoprobe predict shared/boards/corner-8x8.yaml --freq 117.3k --pair a0_0:d3_3 --json
  topoprobe predict shared/boards/chain-24.yaml --bands`,
    )
    .action((file: string, options: PredictOptions) => {
      process.stdout.write(runPredict(file, options));
    });
}

export function runPredict(file: string, options: PredictOptions): string {
  const board = loadBoard(file);
  const laplacian = new GroundedLaplacian(board);
  const pairs = terminalPairs(board, laplacian, options);

  const modeCount = options.modes !== undefined ? parseCount(options.modes, '--modes', board.nodes.length) : undefined;
  const near = options.near !== undefined ? parseFrequency(options.near, '--near') : undefined;
  if (near !== undefined && modeCount === undefined) throw new UsageError('--near goes with --modes K');

  let frequencies = [
    ...(options.freq ?? []).flatMap(parseFrequencyList),
    ...(options.sweep ?? []).flatMap(parseSweep),
  ];
  const needModes = modeCount !== undefined || frequencies.length === 0;
  const modeSet = needModes ? predictModes(laplacian, { count: modeCount ?? 1, near }) : undefined;
  let chosenNote = '';
  if (frequencies.length === 0) {
    const lead = modeSet!.modes[0];
    if (!lead || !(lead.frequency_hz > 0)) {
      throw new UsageError(`${file}: the board has no finite resonance to default to; give --freq or --sweep`);
    }
    frequencies = [lead.frequency_hz];
    chosenNote = `no --freq or --sweep: reading at the ${modeCount ? 'first listed' : 'most localized'} mode, ${formatQuantity(lead.frequency_hz, 'Hz')}`;
  }
  frequencies = [...new Set(frequencies)].sort((a, b) => a - b);
  const bands = options.bands !== undefined ? bandsFor(board, options.bands) : undefined;

  const prediction = predictImpedances(laplacian, frequencies, pairs);
  const warnings = prediction.quality
    .filter((q) => q.residual > RESIDUAL_LIMIT)
    .map((q) => `warning: at ${formatQuantity(q.frequency_hz, 'Hz')} the solve left a relative residual of ${q.residual.toExponential(1)}; J is numerically singular there, treat these values as unreliable`);

  if (options.json) {
    for (const w of warnings) process.stderr.write(`topoprobe: ${w}\n`);
    const doc: Record<string, unknown> = { board: board.name, impedances: prediction.impedances };
    if (modeCount !== undefined) doc.modes = modeSet!.modes;
    if (bands) doc.bands = bands;
    doc.quality = prediction.quality;
    return JSON.stringify(doc, null, 2) + '\n';
  }
  if (chosenNote) process.stderr.write(`${chosenNote}\n`);
  for (const w of warnings) process.stderr.write(`topoprobe: ${w}\n`);
  let out = describeBoard(board);
  if (bands) out += '\n' + bandTable(bands);
  if (modeCount !== undefined) out += '\n' + modeTable(modeSet!.modes, near);
  out += '\n' + impedanceTable(prediction.impedances);
  return out;
}

function terminalPairs(board: Board, laplacian: GroundedLaplacian, options: PredictOptions): TerminalPair[] {
  const check = (name: string, flag: string) => {
    const node = name.toLowerCase() === GROUND ? GROUND : name;
    if (!laplacian.index.has(node)) throw new UsageError(`${flag} ${name}: no node "${name}" on board ${board.name}`);
    return node;
  };
  const pairs: TerminalPair[] = options.node.map((n) => {
    const hi = check(n, '--node');
    if (hi === GROUND) throw new UsageError('--node gnd: ground is the reference; name a board node');
    return { hi, lo: GROUND };
  });
  for (const spec of options.pair) {
    const parts = spec.split(':');
    if (parts.length !== 2 || !parts[0] || !parts[1]) throw new UsageError(`--pair ${spec}: expected HI:LO, e.g. n1:n24`);
    const hi = check(parts[0], '--pair');
    const lo = check(parts[1], '--pair');
    if (hi === lo) throw new UsageError(`--pair ${spec}: both ends are the same node`);
    pairs.push(hi === GROUND ? { hi: lo, lo: GROUND } : { hi, lo });
  }
  return pairs.length > 0 ? pairs : everyNodeToGround(laplacian);
}

function bandsFor(board: Board, option: string | boolean): BandPrediction {
  const points = option === true ? 24 : parseCount(String(option), '--bands', 10_000);
  try {
    return predictBands(board, points);
  } catch (err) {
    if (err instanceof NoLatticeError) throw new UsageError(`--bands: ${err.message}`);
    throw err;
  }
}

function bandTable(b: BandPrediction): string {
  const f = (hz: number) => (Number.isFinite(hz) ? formatQuantity(hz, 'Hz') : 'infinite');
  const rows = b.bands.map((x) => [String(x.band + 1), f(x.min_hz), f(x.max_hz)]);
  let out = `bulk bands (path ${b.path.join('-')} and a uniform grid of phases):\n` + textTable(['band', 'lowest', 'highest'], rows, [true, true, true]);
  out += b.gaps.length === 0
    ? 'no band gap\n'
    : 'band gaps, where boundary modes can live:\n' + b.gaps.map((g) => `  ${f(g.below_hz)} .. ${f(g.above_hz)} (above band ${g.band + 1})\n`).join('');
  return out;
}

function describeBoard(board: Board): string {
  const count = (k: string) => board.parts.filter((p) => p.kind === k).length;
  return `board ${board.name}: ${board.nodes.length} nodes, ${board.parts.length} parts (${count('C')} C, ${count('L')} L, ${count('R')} R)\n`;
}

function modeTable(modes: Mode[], near?: number): string {
  const title = near !== undefined
    ? `modes of the lossless board nearest ${formatQuantity(near, 'Hz')}`
    : 'most localized modes of the lossless board';
  const rows = modes.map((m, i) => [
    String(i + 1),
    formatQuantity(m.frequency_hz, 'Hz'),
    m.localization.toFixed(3),
    largestEntries(m.profile, 4),
  ]);
  return `${title}:\n` + textTable(['#', 'frequency', 'localization', 'largest amplitudes'], rows, [true, true, true, false]);
}

function largestEntries(profile: Record<string, number>, k: number): string {
  return Object.entries(profile)
    .sort((a, b) => Math.abs(b[1]) - Math.abs(a[1]))
    .slice(0, k)
    .map(([node, v]) => `${node} ${v >= 0 ? '+' : ''}${v.toFixed(3)}`)
    .join(', ');
}

function impedanceTable(points: { frequency_hz: number; hi: string; lo: string; re: number; im: number }[]): string {
  // Mark the largest |Z| at each frequency: that is where a boundary mode shows.
  const peak = new Map<number, number>();
  for (const p of points) peak.set(p.frequency_hz, Math.max(peak.get(p.frequency_hz) ?? 0, Math.hypot(p.re, p.im)));
  const rows = points.map((p) => {
    const mag = Math.hypot(p.re, p.im);
    return [
      formatQuantity(p.frequency_hz, 'Hz'),
      p.hi,
      p.lo,
      formatQuantity(mag, 'ohm'),
      ((Math.atan2(p.im, p.re) * 180) / Math.PI).toFixed(1),
      p.re.toPrecision(5),
      p.im.toPrecision(5),
      mag >= (1 - 1e-6) * peak.get(p.frequency_hz)! && points.length > 1 ? '<- largest' : '',
    ];
  });
  return 'impedances:\n' + textTable(['frequency', 'hi', 'lo', '|Z|', 'phase deg', 're ohm', 'im ohm', ''], rows, [true, false, false, true, true, true, true, false]);
}
