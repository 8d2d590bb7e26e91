// `topoprobe run <plan>`: executes a scan plan on the bench (instruments on their lines, or the simulated
// bench in process), judges every reading against its band as it arrives, logs every reading at once, and
// leaves the bench safe however the run ends.
import { existsSync } from 'node:fs';
import path from 'node:path';
import { Command } from 'commander';
import { lastValueFrom, tap } from 'rxjs';
import { loadBoard } from '../board/load.js';
import { profileFrom, ProfileError, type AnalyzerProfile, type InstrumentProfile, type SwitchProfile } from '../instruments/index.js';
import { boardHash } from '../plan/board-hash.js';
import { loadPlan } from '../plan/read-plan.js';
import type { ScanPlan } from '../plan/types.js';
import { benchLinks, startBench, type BenchTarget, type ConnectedBench } from '../run/bench/connect-bench.js';
import { fixtureOf } from '../run/bench/simulated-bench.js';
import { simulatedProbeHands } from '../run/bench/simulated-probes.js';
import { noWaits, realWaits } from '../run/bench-control.js';
import { checkPlanLimits } from '../run/plan-limits.js';
import { errorMessage } from '../run/recovery.js';
import { operatorPrompt, type ProbeGuide } from '../run/probe-guide.js';
import { flagged, EMPTY_TALLY } from '../run/run-tally.js';
import { runScanJob, type JobOutcome } from '../run/scan-job.js';
import { StopSignal } from '../run/stop-signal.js';
import { jsonView, lineView, progressView, type RunView } from '../run/views/run-views.js';

import { defaultLogName } from '../log/log-paths.js';
import { sha256OfFile } from '../log/plan-file-hash.js';
import { checkResume, ScanLog, type LogSetting, type ResumePoint } from '../log/scan-log.js';
import { EXIT, UsageError } from './exit-codes.js';

interface RunOptions {
  sim?: boolean;
  fault: string[];
  seed?: string;
  timing?: string;
  analyzer?: string;
  switch?: string;
  analyzerProfile?: string;
  switchProfile?: string;
  board?: string;
  log?: string;
  resume?: boolean;
  json?: boolean;
  trace?: string;
  operator?: boolean;
}

const collect = (value: string, previous: string[] = []) => [...previous, value];

export function runCommand(): Command {
  return new Command('run')
    .description('execute a scan plan on the bench, judge every reading against its band as it arrives, and log it')
    .argument('<plan>', 'scan plan file (made by topoprobe plan)')
    .option('--sim', 'measure the simulated bench in process: the board as built from the plan\'s board snapshot and the faults')
    .option('--fault <REF=open|short|VALUE>', 'with --sim: an assembly fault on the board as built, e.g. C_intra_0=open; repeatable', collect, [])
    .option('--seed <n>', 'with --sim: seed of the measurement noise (default 1)')
    .option('--timing <mode>', 'with --sim: realistic (relays and readings take their time) or instant (nothing waits) (default realistic)')
    .option('--analyzer <address>', 'the impedance analyzer: a serial port (/dev/ttyUSB0, /dev/ttyUSB0@115200, COM3) or HOST:PORT')
    .option('--switch <address>', 'the switch matrix, addressed the same way')
    .option('--analyzer-profile <name|file>', 'analyzer profile to use instead of the plan\'s')
    .option('--switch-profile <name|file>', 'switch matrix profile to use instead of the plan\'s')
    .option('--board <file>', 'the board on the fixture; refused unless it is the board the plan was made for')
    .option('--log <file>', 'the scan log (CSV) to write; default scan-<board>-<time>.csv in the current folder')
    .option('--resume', 'continue the interrupted log given with --log, with the same plan')
    .option('--json', 'one JSON line per event on stdout and nothing else there')
    .option('--trace <file>', 'append every message to and from the instruments to this file')
    .option('--operator', 'operator-probed: no switch matrix, the operator moves the probes when asked (also when the plan has no switch)')
    .addHelpText(
      'after',
      `
Every reading is written to the log the moment it arrives, then judged: ok, deviation (outside its
magnitude band or its phase arc) or invalid (overload, unreadable). Relays move only with the excitation
at its minimum, break before make, each move confirmed by asking the matrix. Ctrl-C or SIGTERM stop
after the reading in hand: every relay open (confirmed), excitation at its minimum, log closed as
interrupted. A second Ctrl-C does not skip that.

Beside the log, <log>.meta.json records the board snapshot, the plan's sha256, the instruments'
identities, the software version, the start and end times and the status.

Exit codes: 0 complete, every reading in band; 1 complete with deviations or invalid readings;
2 bad input; 3 instrument failure; 130 interrupted.

Examples:
  topoprobe run chain-24.plan.json --sim --timing instant
  topoprobe run chain-24.plan.json --sim --fault C_intra_0=open --log chain-fault.csv
  topoprobe run chain-24.plan.json --analyzer /dev/ttyUSB0 --switch 192.168.1.20:5025 --board shared/boards/chain-24.yaml
  topoprobe run chain-24.plan.json --analyzer /dev/ttyUSB0 --switch /dev/ttyUSB1 --log chain.csv --resume
  topoprobe run chain-24.plan.json --sim --operator`,
    )
    .action(async (planFile: string, options: RunOptions) => {
      process.exitCode = await runPlan(planFile, options);
    });
}

async function runPlan(planFile: string, options: RunOptions): Promise<number> {
  const simulated = checkFlags(options);
  const plan = loadPlan(planFile);
  const planSha256 = sha256OfFile(planFile);
  checkBoard(planFile, plan, options.board);
  const operator = options.operator === true || plan.instruments.switch === null;
  if (operator && options.switch !== undefined) throw new UsageError('--switch: not used in operator-probed mode (--operator, or a plan without a switch matrix)');
  if (!operator && !simulated && options.switch === undefined) throw new UsageError('--switch ADDRESS is needed: the plan closes relays (or give --operator to move the probes by hand)');
  if (operator && options.switchProfile !== undefined) throw new UsageError('--switch-profile: not used in operator-probed mode');

  const analyzerProfile = profileOf(options.analyzerProfile ?? plan.instruments.analyzer, 'analyzer', options.analyzerProfile ? undefined : planFile);
  const switchProfile = operator ? undefined : profileOf(options.switchProfile ?? (plan.instruments.switch as string), 'switch', options.switchProfile ? undefined : planFile);
  checkPlanLimits(planFile, plan, analyzerProfile, switchProfile);

  const logFile = options.log !== undefined ? path.resolve(options.log) : defaultLogName(plan.board.name);
  let resume: ResumePoint | undefined;
  if (options.resume) {
    const known = new Map(plan.steps.map((s) => [s.step, s.points.length]));
    resume = checkResume(logFile, { planSha256, boardHash: plan.board.hash, hasReading: (step, point) => point >= 1 && point <= (known.get(step) ?? 0) });
  } else if (existsSync(logFile)) {
    throw new UsageError(`--log ${logFile}: exists already; give --resume to continue it, or another --log`);
  }

  const sim = simulated ? { faults: options.fault, seed: options.seed === undefined ? 1 : Number(options.seed), timing: (options.timing ?? 'realistic') as 'instant' | 'realistic' } : null;
  const target: BenchTarget = sim
    ? { kind: 'simulated', setup: { board: plan.board.snapshot, faults: sim.faults, seed: sim.seed, timing: sim.timing, fixture: plan.fixture } }
    : { kind: 'lines', analyzer: options.analyzer!, switchMatrix: options.switch };
  const bench = benchLinks({
    target,
    analyzer: analyzerProfile,
    switchMatrix: switchProfile,
    traceFile: options.trace,
    waitForSettling: sim?.timing !== 'instant',
  });

  // From here on a stop request is honoured, not obeyed blindly: the run ends safely.
  const stop = new StopSignal();
  let view: RunView | undefined;
  const onSignal = (signal: NodeJS.Signals) => () => {
    stop.request(signal === 'SIGINT' ? 'interrupted (Ctrl-C)' : `interrupted (${signal})`);
    const text = 'stopping safely… (finishing the reading in hand, opening every relay, excitation to minimum, closing the log)';
    if (view) view.say(text);
    else process.stderr.write(`${text}\n`);
  };
  const handlers = (['SIGINT', 'SIGTERM'] as const).map((signal) => [signal, onSignal(signal)] as const);
  for (const [signal, handler] of handlers) process.on(signal, handler);
  let probes: ProbeGuide | undefined;
  try {
    await startBench(bench);
    const setting = logSetting(planFile, planSha256, plan, bench, analyzerProfile, switchProfile, operator, sim);
    const log = resume ? ScanLog.resume(resume, setting) : ScanLog.create(logFile, setting);
    if (resume) for (const note of resumeDifferences(resume, setting)) process.stderr.write(`topoprobe: warning: ${note}\n`);
    if (resume?.torn !== undefined) {
      process.stderr.write(`topoprobe: ${logFile}: dropped a torn last line (${Buffer.byteLength(resume.torn)} bytes, ${JSON.stringify(resume.torn.slice(0, 60))}); that reading is taken again\n`);
    }
    process.stderr.write(`${resume ? 'continuing' : 'logging to'} ${logFile}\n`);
    if (operator) {
      const hands = bench.simulated ? simulatedProbeHands(bench.simulated, fixtureOf(plan.board.snapshot, plan.fixture)) : undefined;
      probes = operatorPrompt(process.stdin, process.stderr, hands);
    }
    const previous = resume?.tally ?? EMPTY_TALLY;
    view = options.json
      ? jsonView(process.stdout, process.stderr)
      : process.stderr.isTTY
        ? progressView(process.stdout, process.stderr, logFile, previous)
        : lineView(process.stdout, process.stderr, logFile);
    let outcome: JobOutcome | undefined;
    let logFailure: unknown;
    const shown = view;
    await lastValueFrom(
      runScanJob({
        plan,
        planName: planFile,
        analyzer: bench.analyzer,
        switchMatrix: bench.switchMatrix,
        probes,
        done: resume?.done,
        previous,
        stop,
        waits: sim?.timing === 'instant' ? noWaits : realWaits,
        onOutcome: (o) => (outcome = o),
      }).pipe(
        // The log first: a reading is on disk before it is shown anywhere. A log that cannot be written
        // (a full disk) stops the run as failed, after the reading in hand, so the bench is still left safe.
        tap((event) => {
          try {
            log.record(event);
          } catch (error) {
            if (logFailure === undefined) {
              logFailure = error;
              stop.fail(error);
            }
            if (event.event === 'reading') return;
          }
          // The closing counts are the log's: a reading the log could not take was never reported either.
          shown.show(event.event === 'done' ? { ...event, ...log.counts } : event);
        }),
      ),
      { defaultValue: undefined },
    );
    view.close();
    const safety = outcome?.done.safe ? 'bench left safe (every relay open, excitation at its minimum)' : 'bench NOT confirmed safe (check it by hand)';
    if (logFailure !== undefined) {
      process.stderr.write(
        `topoprobe: ${errorMessage(logFailure)}; ${log.counts.readings} readings are safe in it (every one reported); ${safety}; make room and continue with --resume\n`,
      );
      return EXIT.instrument;
    }
    // The views put the summary on stdout (or, with --json, an event): the reason a run failed is also one line on stderr.
    if (outcome?.done.status === 'failed') process.stderr.write(`topoprobe: scan failed: ${outcome.done.reason ?? 'unknown failure'}; ${safety}\n`);
    return exitCodeOf(outcome);
  } finally {
    probes?.close();
    await bench.close();
    for (const [signal, handler] of handlers) process.off(signal, handler);
  }
}

function exitCodeOf(outcome: JobOutcome | undefined): number {
  if (!outcome) return EXIT.instrument;
  const { done, cause } = outcome;
  if (done.status === 'interrupted') return EXIT.interrupted;
  if (done.status === 'failed') return cause === 'instrument' ? EXIT.instrument : EXIT.badInput;
  return flagged(done) > 0 ? EXIT.deviations : EXIT.ok;
}

/** Which bench: true for --sim. Every flag that does not fit the others is one line, exit 2. */
function checkFlags(o: RunOptions): boolean {
  const simulated = o.sim === true;
  if (simulated && (o.analyzer !== undefined || o.switch !== undefined)) throw new UsageError('--sim measures the simulated bench: leave out --analyzer and --switch');
  if (!simulated && o.analyzer === undefined) throw new UsageError('give --sim, or --analyzer ADDRESS (with --switch ADDRESS unless --operator)');
  if (!simulated) {
    for (const [flag, given] of [['--fault', o.fault.length > 0], ['--seed', o.seed !== undefined], ['--timing', o.timing !== undefined]] as const) {
      if (given) throw new UsageError(`${flag} goes with --sim`);
    }
  }
  // A safe integer only: a larger seed would not be the one recorded in the log's meta (which refuses it).
  if (o.seed !== undefined && (!/^-?\d+$/.test(o.seed) || !Number.isSafeInteger(Number(o.seed)))) {
    throw new UsageError(`--seed ${o.seed}: expected a whole number from -${Number.MAX_SAFE_INTEGER} to ${Number.MAX_SAFE_INTEGER}`);
  }
  if (o.timing !== undefined && o.timing !== 'instant' && o.timing !== 'realistic') throw new UsageError(`--timing ${o.timing}: expected realistic or instant`);
  if (o.resume && o.log === undefined) throw new UsageError('--resume needs --log FILE, the log to continue');
  return simulated;
}

/** "A plan made for one board refuses another": the board on the fixture must hash as the plan's. */
function checkBoard(planFile: string, plan: ScanPlan, boardFile: string | undefined): void {
  // (loadPlan has already checked the plan's hash against its own snapshot.)
  if (boardFile === undefined) return;
  const board = loadBoard(boardFile);
  const hash = boardHash(board);
  if (hash !== plan.board.hash) {
    throw new UsageError(
      `--board ${boardFile}: board ${board.name} (hash ${hash.slice(0, 12)}…) is not the board ${plan.board.name} (hash ${plan.board.hash.slice(0, 12)}…) that ${planFile} was made for; make a plan for this board`,
    );
  }
}

function profileOf(nameOrPath: string, kind: 'analyzer', planFile?: string): AnalyzerProfile;
function profileOf(nameOrPath: string, kind: 'switch', planFile?: string): SwitchProfile;
function profileOf(nameOrPath: string, kind: 'analyzer' | 'switch', planFile?: string): InstrumentProfile {
  // A path written in the plan is relative to the plan's folder; one on the command line to the current one.
  const isPath = /[/\\]|\.(ya?ml|json)$/i.test(nameOrPath);
  const where = isPath && planFile && !path.isAbsolute(nameOrPath) ? path.join(path.dirname(planFile), nameOrPath) : nameOrPath;
  let profile: InstrumentProfile;
  try {
    profile = profileFrom(where);
  } catch (error) {
    // A profile the plan names: say which plan and field named it, or the user looks for the wrong file.
    if (planFile && error instanceof ProfileError) throw new ProfileError(error.problems.map((p) => ({ ...p, file: `${planFile}: instruments.${kind}: ${p.file}` })));
    throw error;
  }
  if (profile.kind !== kind) {
    const flag = planFile ? `${planFile}: instruments.${kind}` : `--${kind}-profile`;
    throw new UsageError(`${flag}: ${nameOrPath} is ${profile.kind === 'analyzer' ? 'an analyzer' : 'a switch matrix'} profile, expected ${kind === 'analyzer' ? 'an analyzer' : 'a switch matrix'} profile`);
  }
  return profile;
}

function logSetting(
  planFile: string,
  planSha256: string,
  plan: ScanPlan,
  bench: ConnectedBench,
  analyzer: AnalyzerProfile,
  matrix: SwitchProfile | undefined,
  operator: boolean,
  sim: { faults: string[]; seed: number; timing: 'instant' | 'realistic' } | null,
): LogSetting {
  return {
    plan: { file: path.resolve(planFile), sha256: planSha256, created: plan.created, software: plan.software },
    board: { name: plan.board.name, hash: plan.board.hash, snapshot: plan.board.snapshot },
    mode: operator ? 'operator' : 'switched',
    instruments: {
      analyzer: { profile: analyzer.name, address: bench.addresses.analyzer, identity: bench.analyzer.identity ?? null },
      switch: matrix && bench.switchMatrix ? { profile: matrix.name, address: bench.addresses.switchMatrix ?? '', identity: bench.switchMatrix.identity ?? null } : null,
    },
    simulated: sim,
  };
}

/** What differs from the run that started the log: allowed (an instrument may be swapped), but said. */
function resumeDifferences(resume: ResumePoint, now: LogSetting): string[] {
  const notes: string[] = [];
  const before = resume.meta.instruments;
  for (const role of ['analyzer', 'switch'] as const) {
    const was = before[role]?.identity?.raw;
    const is = now.instruments[role]?.identity?.raw;
    if (was !== undefined && is !== undefined && was !== is) notes.push(`the ${role} answers ${JSON.stringify(is)}; the log was started with ${JSON.stringify(was)}`);
  }
  const sim = (s: LogSetting['simulated']) => (s ? `simulated bench (faults ${s.faults.join(', ') || 'none'}, seed ${s.seed}, ${s.timing})` : 'instruments');
  if (sim(resume.meta.simulated) !== sim(now.simulated)) notes.push(`this run measures the ${sim(now.simulated)}; the log was started on the ${sim(resume.meta.simulated)}`);
  if (resume.meta.mode !== now.mode) notes.push(`this run is ${now.mode}; the log was started ${resume.meta.mode}`);
  return notes;
}
