// The suite runner: every (scenario × build) pair, in parallel on worker threads, with results in
// a deterministic order whatever the parallelism. Each finished pair is saved at once
// (runs/<key>.json, atomically), so a killed run leaves no truncated file and resume picks up
// where it stopped. What a results folder holds besides runs/ is the `run` command's business
// (harness/commands/run.ts); this engine knows nothing of gates, reports or exit codes.

import { readdirSync, readFileSync, rmSync } from 'node:fs';
import path from 'node:path';
import { buildContentIdentity } from '../builds/contentIdentity.js';
import { spinFitsCores } from '../builds/process/bridge.js';
import type { BuildSpec } from '../builds/spec.js';
import { removeStaleTemps, writeFileAtomicSync } from '../files/atomic.js';
import { createErrorRunResult } from '../results/runResult.js';
import type { RunResult } from '../results/types.js';
import type { ResolvedScenario } from '../scenario/types.js';
import { seriesPath } from '../score/series/file.js';
import type { PackedObservations } from '../contract/packed.js';
import { observationsOf, type ObservationRequest } from './observed.js';
import { keepOnResume, onInterrupt, type InterruptSignal } from './interrupt.js';
import { realFolder } from './outputLock.js';
import { createRunPool, defaultJobs, runOnPool, DEFAULT_RUN_TIMEOUT, RunInterruptedError, type RunTimeout } from './pool.js';
import type { PreparedBuild } from './prepare.js';
import { chooseProgressMode, createProgress } from './progress.js';
import { shardIndices, type ShardSpec } from './shard.js';

export const RUNS_FOLDER = 'runs';

/**
 * SIGINT/SIGTERM stopped the suite: the pool was aborted (every build's process group killed), the
 * runs finished so far are saved in runs/, and --resume finishes the rest.
 */
export class SuiteInterruptedError extends Error {
  constructor(
    readonly signal: InterruptSignal,
    readonly saved: number,
    readonly total: number,
    readonly runsDir: string,
  ) {
    super(`interrupted by ${signal}: ${saved} of ${total} runs are saved in ${runsDir}; run the same command again with --resume to finish the rest`);
    this.name = 'SuiteInterruptedError';
  }
}

export interface PairRunOptions {
  /** In the canonical order (run/prepare.ts); builds as given. */
  scenarios: readonly ResolvedScenario[];
  builds: readonly BuildSpec[];
  /** Builds prepared elsewhere (git refs), by name: a failed one makes its runs `error` runs. */
  prepared?: ReadonlyMap<string, PreparedBuild>;
  /** Absolute results folder; runs/ (and traces/) go below it. */
  outDir: string;
  trace?: boolean;
  traceEveryNth?: number;
  jobs?: number;
  shard?: ShardSpec;
  /** Keep saved runs of unchanged pairs (same scenario hash, build name and build content). */
  resume?: boolean;
  quiet?: boolean;
  runTimeout?: RunTimeout;
  /** The folder as the person named it, for the resume line. */
  outLabel?: string;
  log: (line: string) => void;
  /** Filled with the absolute path of the series file of every pair run now (not resumed, not an error run). */
  writtenSeries?: Set<string>;
  /** Runs of `build` on the scenarios named in `requests` keep what the build observed (observed.ts). */
  observe?: { build: string; requests: ReadonlyMap<string, ObservationRequest>; onObserved(scenarioId: string, observations: PackedObservations): void };
}

interface Pair {
  scenario: ResolvedScenario;
  build: BuildSpec;
  key: string;
}

/** File-safe key of a pair, also its saved result's name. */
export function pairKey(scenarioId: string, buildName: string): string {
  const safe = (s: string) => s.replace(/[^A-Za-z0-9._-]/g, '_');
  return `${safe(scenarioId)}__${safe(buildName)}`;
}

/** Runs the pairs (this shard's, those not resumed) and returns every run in pair order. */
export async function runPairs(options: PairRunOptions): Promise<RunResult[]> {
  const { outDir, log } = options;
  const prepared = options.prepared ?? new Map<string, PreparedBuild>();
  let pairs: Pair[] = [];
  for (const scenario of options.scenarios) {
    for (const build of options.builds) pairs.push({ scenario, build, key: pairKey(scenario.id, build.name) });
  }
  if (options.shard) {
    const mine = shardIndices(pairs.map((p) => p.scenario.duration_s), options.shard);
    pairs = mine.map((i) => pairs[i]);
  }

  // Deletion below never follows a link: runs/ and traces/ must be real folders (OutputFolderError).
  const runsDir = realFolder(path.join(outDir, RUNS_FOLDER));
  removeStaleTemps(outDir);
  removeStaleTemps(runsDir);
  if (options.trace) removeStaleTemps(realFolder(path.join(outDir, 'traces')));

  // What code each build runs, as a hash of its files: a saved run of an edited build is stale.
  const identities = new Map(options.builds.map((build) => [build.name, buildContentIdentity(build).sha256]));
  const saved = options.resume ? readSavedRuns(runsDir) : new Map<string, SavedRun>();
  if (!options.resume) clearSavedRuns(runsDir);
  const results = new Map<string, RunResult>();
  const pending: Pair[] = [];
  const stale = new Map<string, string>();
  for (const pair of pairs) {
    const previous = saved.get(pair.key);
    const identity = identities.get(pair.build.name);
    if (previous === undefined) pending.push(pair);
    else if (!keepOnResume(previous.result.error?.reason)) pending.push(pair);
    else if (previous.result.scenario.hash !== pair.scenario.hash || previous.result.build !== pair.build.name) {
      stale.set(`scenario ${pair.scenario.id}`, 'its content changed');
      pending.push(pair);
    } else if (previous.buildIdentity !== identity) {
      stale.set(`build ${pair.build.name}`, previous.buildIdentity === undefined ? 'the saved run does not say which code it ran' : 'its code changed (module, imports, program or options)');
      pending.push(pair);
    } else results.set(pair.key, previous.result);
  }
  if (options.resume) {
    log(`resuming: ${results.size} of ${pairs.length} runs already complete in ${options.outLabel ?? outDir}`);
    for (const [what, why] of stale) log(`  rerunning the saved runs of ${what}: ${why}`);
  }

  const observeRequest = (pair: Pair) => (options.observe && pair.build.name === options.observe.build ? options.observe.requests.get(pair.scenario.id) : undefined);
  const jobs = Math.max(1, Math.min(options.jobs ?? defaultJobs(), pending.length || 1));
  const progress = createProgress(chooseProgressMode({ quiet: options.quiet }), pending.length, log);
  const timeout = options.runTimeout ?? DEFAULT_RUN_TIMEOUT;
  const pool = createRunPool(jobs);
  // Each run thread waits on its own process build: a spinning thread on a full machine would
  // delay the very build it waits for, so the answer spin is off unless every job has two cores.
  const buildOptions = spinFitsCores(jobs) ? undefined : { spin_us: 0 };
  let interrupted: InterruptSignal | undefined;
  const stopWatching = onInterrupt((signal) => {
    interrupted = signal;
    pool.abort(signal);
  });
  try {
    await Promise.all(
      pending.map(async (pair) => {
        const started = performance.now();
        const failure = prepared.get(pair.build.name)?.failure;
        let result: RunResult;
        try {
          result = failure
            ? createErrorRunResult(pair.scenario, pair.build.name, { message: failure.message, reason: 'build-failed', stderrTail: failure.outputTail })
            : await runOnPool(pool, { scenario: pair.scenario, build: pair.build, outDir, trace: options.trace ?? false, traceEveryNth: options.traceEveryNth, observe: observeRequest(pair), buildOptions }, timeout);
        } catch (error) {
          if (error instanceof RunInterruptedError) return; // not saved: --resume runs it
          throw error;
        }
        const record: SavedRun = { buildIdentity: identities.get(pair.build.name), result };
        writeFileAtomicSync(path.join(runsDir, `${pair.key}.json`), `${JSON.stringify(record)}\n`, { durable: false });
        results.set(pair.key, result);
        const observations = observationsOf(result);
        if (observations) options.observe?.onObserved(pair.scenario.id, observations);
        // An error run may have stopped before its series was written: its file (if any) is checked.
        if (result.status !== 'error') options.writtenSeries?.add(path.join(outDir, seriesPath(pair.scenario.id, pair.build.name)));
        // The run's own wall time (measured in its worker); queueing time is not the run's.
        progress.done(result, result.sim?.wall_s ?? (performance.now() - started) / 1000);
      }),
    );
  } finally {
    stopWatching();
    progress.stop();
    await pool.close();
  }
  if (interrupted !== undefined) throw new SuiteInterruptedError(interrupted, results.size, pairs.length, path.relative(process.cwd(), runsDir) || runsDir);
  return pairs.map((pair) => results.get(pair.key) as RunResult);
}

/** A saved run (runs/<key>.json): the result and the content identity of the build that made it. */
interface SavedRun {
  buildIdentity?: string;
  result: RunResult;
}

export function countStatuses(runs: readonly RunResult[]): Record<'pass' | 'fail' | 'error', number> {
  const counts = { pass: 0, fail: 0, error: 0 };
  for (const r of runs) counts[r.status]++;
  return counts;
}

function readSavedRuns(runsDir: string): Map<string, SavedRun> {
  const saved = new Map<string, SavedRun>();
  for (const name of readdirSync(runsDir)) {
    if (!name.endsWith('.json') || name.startsWith('.')) continue;
    try {
      const record = JSON.parse(readFileSync(path.join(runsDir, name), 'utf8')) as Partial<SavedRun>;
      // Anything without a result of the expected shape is simply run again.
      if (record && typeof record === 'object' && record.result && typeof record.result === 'object' && record.result.scenario) {
        saved.set(name.slice(0, -'.json'.length), record as SavedRun);
      }
    } catch {
      // An unreadable saved run is simply run again.
    }
  }
  return saved;
}

function clearSavedRuns(runsDir: string): void {
  for (const name of readdirSync(runsDir)) if (name.endsWith('.json')) rmSync(path.join(runsDir, name), { force: true });
}
