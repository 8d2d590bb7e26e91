// Which part is to blame: every part of the board is tried as the single cause of the deviations in a
// set of readings (its value refitted, open, shorted), and so is the fixture path of every node; the
// explanations are ranked by how much of the deviation they account for. The readings with a part
// changed come from rank-one updates of the factored J (rank-one.ts), so the whole search costs about
// one factorization and a few solves per frequency.
// The nominal readings are computed here from the board rather than taken from the rows' pred_re and
// pred_im, so that the nominal and the changed boards come from the same factorization and differ only
// by the change tried. Readings flagged ok and deviation are used alike: a true cause must also leave
// the readings that agree as they are.
import type { Board, Part } from '../board/types.js';
import { GroundedLaplacian } from '../circuit/laplacian.js';
import { ImpedanceSolver, SingularBoardError } from '../circuit/impedance.js';
import { formatQuantity } from '../units/format.js';
import { SHORT_OHMS } from './diagnose-change.js';
import { describeFixture, describePart, describeVerdict, fixtureName } from './diagnose-describe.js';
import { DiagnoseError } from './diagnose-error.js';
import { fitFixturePaths, type FixtureFit } from './diagnose-fixture.js';
import { fitCommonLeads, type CommonLeads, type LeadSet } from './diagnose-leads.js';
import { MisfitMeter } from './diagnose-misfit.js';
import type { ReadingModel } from './diagnose-model.js';
import { fitParts, type PartFit } from './diagnose-parts.js';
import { RefactorModel } from './diagnose-refactor.js';
import { prepareScan, type PreparedScan } from './diagnose-scan.js';
import type { Candidate, DiagnoseOptions, Diagnosis, FixtureCandidate, PartCandidate, PartFinding, PartPair, Verdict } from './diagnose-types.js';
import { decadeOffset, nearestPreferred, seriesForTolerance } from './e-series.js';
import { RankOneModel } from './rank-one-model.js';
import { SolvedEntries, type ImpedanceEntries } from './rank-one.js';
import type { Reading } from './readings.js';

export type * from './diagnose-types.js';
export { DiagnoseError } from './diagnose-error.js';

const DEFAULTS = { noise: 1e-3, minShare: 0.9, noiseMisfit: 5, limit: 5, fixture: true, leads: true, pairs: true, method: 'rank-one' } as const;
/**
 * Mean misfit per reading that noise alone leaves when `noise` is right: the squared size of a complex
 * residual with independent normal parts of unit variance has mean 2 (a chi-square with two degrees of
 * freedom, common practice); the Huber knee at 3 barely lowers it.
 */
export const NOISE_ONLY_MISFIT = 2;

/**
 * 1 - residual / nominal misfit, both counted beyond what noise alone leaves: otherwise a deviation on a
 * few readings is diluted by the noise of all the others, and even the exact cause could not reach a
 * high share. Clamped to [0, 1].
 */
export function shareOfDeviation(misfit: number, nominalMisfit: number): number {
  const deviation = nominalMisfit - NOISE_ONLY_MISFIT;
  if (!(deviation > 0)) return 0;
  const left = Math.max(misfit - NOISE_ONLY_MISFIT, 0);
  return Math.min(Math.max(1 - left / deviation, 0), 1);
}

/** First parts the greedy two-part search starts from. */
const PAIR_STARTS = 3;
/** Misfits this close to the leader's (relative, absolute) cannot be told apart by these readings. */
const TIE_RELATIVE = 0.01;
const TIE_ABSOLUTE = 0.05;

interface Settings {
  noise: number;
  floorOhms: number;
  minShare: number;
  noiseMisfit: number;
  limit: number;
  parts: Part[];
  fixture: boolean;
  leads: boolean;
  pairs: boolean;
  method: 'rank-one' | 'refactor';
}

/** Ranks single-part (and fixture) explanations of `readings` taken on `board`. Throws DiagnoseError. */
export function diagnose(board: Board, readings: readonly Reading[], options: DiagnoseOptions = {}): Diagnosis {
  const settings = resolveOptions(board, options);
  const notes: string[] = [];
  const { scan, entries } = solvableScan(board, readings, notes);
  const model: ReadingModel = settings.method === 'refactor' ? new RefactorModel(scan, settings.parts, board) : new RankOneModel(scan, settings.parts, entries);
  const bare = new MisfitMeter(scan, settings.noise, settings.floorOhms);
  const nominal = new Float64Array(2 * scan.readings.length);
  model.nominal(nominal);
  // The common leads are fitted to the nominal board first (is it as designed, seen through some fixture?),
  // then again with the leading part's change, and the parts ranked once more through those: a faulty part
  // moves the readings the first fit had to bend the leads for.
  let leads = settings.leads ? fitCommonLeads(bare, nominal) : undefined;
  let meter = leads ? bare.withLeads(leads) : bare;
  const asDesignedMisfit = meter.of(nominal);
  let fits = fitParts(model, meter);
  if (leads && fits.length > 0) {
    const withLeader = new Float64Array(nominal.length);
    model.predict(fits[0].part, fits[0].change, withLeader);
    const refitted = fitCommonLeads(bare, withLeader);
    const refittedMeter = bare.withLeads(refitted);
    if (refittedMeter.of(withLeader) < meter.of(withLeader)) {
      leads = refitted;
      meter = refittedMeter;
      fits = fitParts(model, meter);
    }
  }
  const nominalMisfit = meter.of(nominal);
  const shareOf = (misfit: number) => shareOfDeviation(misfit, nominalMisfit);
  const partCandidates = fits.map((fit) => partCandidate(model.parts[fit.part], fit, shareOf(fit.misfit)));
  const fixtureCandidates = settings.fixture ? fitFixturePaths(scan, nominal, meter).map((fit) => fixtureCandidate(fit, shareOf(fit.misfit))) : [];
  const ranked: Candidate[] = [...partCandidates, ...fixtureCandidates].sort((a, b) => a.misfit - b.misfit);
  const leader = ranked[0];
  const explains = (c: { share: number; misfit: number }) => c.share >= settings.minShare && c.misfit <= settings.noiseMisfit;

  let verdict: Verdict;
  let pair: PartPair | undefined;
  if (asDesignedMisfit <= settings.noiseMisfit) verdict = 'as-designed';
  else if (leader && explains(leader)) verdict = leader.subject === 'part' ? 'single-part' : 'fixture';
  else {
    const found = settings.pairs ? greedyPair(model, meter, fits, shareOf, leads ? bare : undefined) : undefined;
    if (found) {
      const { leads: pairLeads, ...rest } = found;
      pair = rest;
      if (explains(pair) && pairLeads) leads = pairLeads;
    }
    verdict = pair && explains(pair) ? 'several-faults' : 'unexplained';
  }
  let message = describeVerdict(verdict, leader, pair);
  if (leader && verdict !== 'as-designed') {
    const tied = tiedWith(ranked, leader);
    const note = tieNote(leader, tied);
    if (note) notes.push(note);
    if (tied.length > 0 && (verdict === 'single-part' || verdict === 'fixture')) message += `; ${tied.map((c) => c.ref).join(', ')} explain it equally well`;
  }

  if (leads && [leads.twoTerminal, leads.transfer].some((l) => l.ohms > 0 || l.henries > 0 || l.farads > 0)) notes.push(describeLeads(leads));
  return {
    board: board.name,
    verdict,
    message,
    readings: { used: scan.readings.length, skipped: scan.skipped },
    noise: settings.noise,
    nominalMisfit,
    ...(leads ? { leads } : {}),
    candidates: ranked.slice(0, settings.limit),
    ...(pair ? { pair } : {}),
    notes,
  };
}

/**
 * The prepared readings with Z at each of their frequencies. A frequency where the nominal board has no
 * solution (a lossless resonance hit exactly) cannot be diagnosed: its readings are left out, with a note.
 */
function solvableScan(board: Board, readings: readonly Reading[], notes: string[]): { scan: PreparedScan; entries: ImpedanceEntries[] } {
  const solver = new ImpedanceSolver(new GroundedLaplacian(board));
  const names = solver.laplacian.index.names;
  let scan = prepareScan(board, readings);
  const singular = new Set<number>();
  let entries: ImpedanceEntries[] = [];
  for (const group of scan.groups) {
    try {
      entries.push(new SolvedEntries(solver.at(group.frequencyHz), names));
    } catch (err) {
      if (!(err instanceof SingularBoardError)) throw err;
      singular.add(group.frequencyHz);
      notes.push(`${formatQuantity(group.frequencyHz, 'Hz')}: left out, J of the nominal board is singular there (at node ${err.node})`);
    }
  }
  if (singular.size > 0) {
    const kept = readings.filter((r) => r.flag === 'invalid' || !singular.has(r.frequency_hz));
    if (!kept.some((r) => r.flag !== 'invalid')) throw new DiagnoseError(`no readings to diagnose: J of board ${board.name} is singular at every frequency read`);
    scan = prepareScan(board, kept);
    entries = scan.groups.map((g) => new SolvedEntries(solver.at(g.frequencyHz), names));
  }
  return { scan, entries };
}

function partCandidate(part: Part, fit: PartFit, share: number): PartCandidate {
  let change: PartFinding;
  if (fit.change.kind === 'scale') {
    const value = part.value * fit.change.scale;
    change = {
      kind: 'value',
      value,
      scale: fit.change.scale,
      nearest: nearestPreferred(value, seriesForTolerance(part.tolerance)),
      decades: decadeOffset(value, part.value),
    };
  } else change = fit.change.kind === 'open' ? { kind: 'open' } : { kind: 'short', ohms: SHORT_OHMS };
  const candidate: Omit<PartCandidate, 'summary'> = {
    subject: 'part',
    ref: part.ref,
    kind: part.kind,
    nodes: part.nodes,
    nominal: part.value,
    change,
    misfit: fit.misfit,
    share,
  };
  return { ...candidate, summary: describePart(candidate) };
}

function fixtureCandidate(fit: FixtureFit, share: number): FixtureCandidate {
  const candidate: Omit<FixtureCandidate, 'summary'> = {
    subject: 'fixture',
    ref: fixtureName(fit.node, fit.path),
    kind: 'fixture',
    node: fit.node,
    path: fit.path,
    change: fit.change,
    readings: fit.readings,
    misfit: fit.misfit,
    share,
  };
  return { ...candidate, summary: describeFixture(candidate) };
}

/**
 * Two faults, greedily: each of the best few single parts is taken as found, and every other part is fitted
 * on what it leaves (from the same factorization, see rank-one.ts). The second part's misfit and share are
 * those of both changes together.
 */
function greedyPair(
  model: ReadingModel,
  meter: MisfitMeter,
  fits: readonly PartFit[],
  shareOf: (misfit: number) => number,
  /** When the common leads are fitted: the meter without them, to fit them again to the pair found. */
  bare?: MisfitMeter,
): (PartPair & { leads?: CommonLeads }) | undefined {
  let best: { first: PartFit; second: PartFit; after: ReadingModel } | undefined;
  for (const first of fits.slice(0, PAIR_STARTS)) {
    const after = model.after(first.part, first.change);
    const [second] = fitParts(after, meter, new Set([first.part]));
    if (second && (!best || second.misfit < best.second.misfit)) best = { first, second, after };
  }
  if (!best) return undefined;
  let misfit = best.second.misfit;
  let leads: CommonLeads | undefined;
  if (bare) {
    // The leads were fitted with one part changed; two changed parts may ask for other leads.
    const both = new Float64Array(2 * model.scan.readings.length);
    best.after.predict(best.second.part, best.second.change, both);
    const refitted = fitCommonLeads(bare, both);
    const refittedMisfit = bare.withLeads(refitted).of(both);
    if (refittedMisfit < misfit) {
      misfit = refittedMisfit;
      leads = refitted;
    }
  }
  const share = shareOf(misfit);
  return {
    first: partCandidate(model.parts[best.first.part], best.first, shareOf(best.first.misfit)),
    second: partCandidate(best.after.parts[best.second.part], { ...best.second, misfit }, share),
    misfit,
    share,
    ...(leads ? { leads } : {}),
  };
}

function describeLeads(leads: CommonLeads): string {
  const set = (l: LeadSet) => `${formatQuantity(l.ohms, 'ohm', 2)} and ${formatQuantity(l.henries, 'H', 2)} in series, ${formatQuantity(l.farads, 'F', 2)} to ground`;
  return `fixture common to all readings fitted and kept out of the blame: ${set(leads.twoTerminal)} (two-terminal readings); ${set(leads.transfer)} (transfer readings)`;
}

/** Candidates that fit as well as the leader; these readings cannot choose between them. */
function tiedWith(ranked: readonly Candidate[], leader: Candidate): Candidate[] {
  const margin = Math.max(TIE_RELATIVE * leader.misfit, TIE_ABSOLUTE);
  return ranked.slice(1).filter((c) => c.misfit - leader.misfit <= margin);
}

function tieNote(leader: Candidate, tied: readonly Candidate[]): string | undefined {
  if (tied.length === 0) return undefined;
  const all = [leader, ...tied];
  const refs = all.map((c) => c.ref).join(', ');
  const span = (c: Candidate) => (c.subject === 'part' ? [...c.nodes].sort().join(' ') : undefined);
  const first = span(leader);
  if (first !== undefined && all.every((c) => span(c) === first)) {
    // Parts between the same two nodes act as one admittance: no reading anywhere can split them.
    return `${refs} sit in parallel (${leader.subject === 'part' ? leader.nodes.join('–') : ''}) and fit equally well; no reading tells them apart, look at the board`;
  }
  return `${refs} fit these readings equally well; readings at other nodes or frequencies may tell them apart`;
}

function resolveOptions(board: Board, options: DiagnoseOptions): Settings {
  const noise = options.noise ?? DEFAULTS.noise;
  if (!(noise > 0 && noise < 1)) throw new DiagnoseError(`option noise must be a relative scatter between 0 and 1 (e.g. 0.001), got ${String(noise)}`);
  const minShare = options.minShare ?? DEFAULTS.minShare;
  if (!(minShare > 0 && minShare <= 1)) throw new DiagnoseError(`option minShare must be a share above 0 and at most 1 (e.g. 0.9), got ${String(minShare)}`);
  const noiseMisfit = options.noiseMisfit ?? DEFAULTS.noiseMisfit;
  if (!(noiseMisfit > 0) || !Number.isFinite(noiseMisfit)) throw new DiagnoseError(`option noiseMisfit must be a positive number (e.g. 5), got ${String(noiseMisfit)}`);
  const limit = options.limit ?? DEFAULTS.limit;
  if (!Number.isInteger(limit) || limit < 1) throw new DiagnoseError(`option limit must be a whole number of candidates, at least 1, got ${String(limit)}`);
  const method = options.method ?? DEFAULTS.method;
  if (method !== 'rank-one' && method !== 'refactor') throw new DiagnoseError(`option method must be rank-one or refactor, got ${JSON.stringify(method)}`);
  let parts = board.parts;
  if (options.parts !== undefined) {
    if (options.parts.length === 0) throw new DiagnoseError('option parts names no part; leave it out to try every part');
    const byRef = new Map(board.parts.map((p) => [p.ref, p]));
    parts = options.parts.map((ref) => {
      const part = byRef.get(ref);
      if (!part) throw new DiagnoseError(`option parts: no part ${JSON.stringify(ref)} on board ${board.name}`);
      return part;
    });
  }
  const floorOhms = options.floorOhms ?? 0;
  if (!(floorOhms >= 0) || !Number.isFinite(floorOhms)) throw new DiagnoseError(`option floorOhms must be zero or a positive resistance in ohms (e.g. 0.5), got ${String(floorOhms)}`);
  return {
    noise,
    floorOhms,
    minShare,
    noiseMisfit,
    limit,
    parts: [...parts],
    fixture: options.fixture ?? DEFAULTS.fixture,
    leads: options.leads ?? DEFAULTS.leads,
    pairs: options.pairs ?? DEFAULTS.pairs,
    method,
  };
}
