// The suite runner: every (scenario × build) pair, in parallel on worker threads, with results in
// a deterministic order whatever the parallelism. Each finished pair is saved at once
// (runs/<key>.json, atomically), so a killed run leaves no truncated file and resume picks up
// where it stopped. What a results folder holds besides runs/ is the `run` command's business
// (harness/commands/run.ts); this engine knows nothing of gates, reports or exit codes.

import { mkdirSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import path from 'node:path';
import type { BuildSpec } from '../builds/spec.js';
import { removeStaleTemps, writeFileAtomicSync } from '../files/atomic.js';
import { createErrorRunResult } from '../results/runResult.js';
import type { RunResult } from '../results/types.js';
import type { ResolvedScenario } from '../scenario/types.js';
import { createRunPool, defaultJobs, runOnPool, DEFAULT_RUN_TIMEOUT, type RunTimeout } from './pool.js';
import type { PreparedBuild } from './prepare.js';
import { chooseProgressMode, createProgress } from './progress.js';
import { shardIndices, type ShardSpec } from './shard.js';

export const RUNS_FOLDER = 'runs';

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
  /** Keep saved runs of unchanged pairs (same scenario hash and build name). */
  resume?: boolean;
  quiet?: boolean;
  runTimeout?: RunTimeout;
  /** The folder as the person named it, for the resume line. */
  outLabel?: string;
  log: (line: string) => void;
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

  const runsDir = path.join(outDir, RUNS_FOLDER);
  mkdirSync(runsDir, { recursive: true });
  removeStaleTemps(outDir);
  removeStaleTemps(runsDir);
  if (options.trace) {
    mkdirSync(path.join(outDir, 'traces'), { recursive: true });
    removeStaleTemps(path.join(outDir, 'traces'));
  }

  const saved = options.resume ? readSavedRuns(runsDir) : new Map<string, RunResult>();
  if (!options.resume) clearSavedRuns(runsDir);
  const results = new Map<string, RunResult>();
  const pending: Pair[] = [];
  for (const pair of pairs) {
    const previous = saved.get(pair.key);
    // A build that could not be prepared last time is tried again, not resumed as an error.
    const reusable = previous && previous.error?.reason !== 'build-failed';
    if (reusable && previous.scenario.hash === pair.scenario.hash && previous.build === pair.build.name) results.set(pair.key, previous);
    else pending.push(pair);
  }
  if (options.resume) log(`resuming: ${results.size} of ${pairs.length} runs already complete in ${options.outLabel ?? outDir}`);

  const jobs = Math.max(1, Math.min(options.jobs ?? defaultJobs(), pending.length || 1));
  const progress = createProgress(chooseProgressMode({ quiet: options.quiet }), pending.length, log);
  const timeout = options.runTimeout ?? DEFAULT_RUN_TIMEOUT;
  const pool = createRunPool(jobs);
  try {
    await Promise.all(
      pending.map(async (pair) => {
        const started = performance.now();
        const failure = prepared.get(pair.build.name)?.failure;
        const result = failure
          ? createErrorRunResult(pair.scenario, pair.build.name, { message: failure.message, reason: 'build-failed', stderrTail: failure.outputTail })
          : await runOnPool(pool, { scenario: pair.scenario, build: pair.build, outDir, trace: options.trace ?? false, traceEveryNth: options.traceEveryNth }, timeout);
        writeFileAtomicSync(path.join(runsDir, `${pair.key}.json`), `${JSON.stringify(result)}\n`);
        results.set(pair.key, result);
        // The run's own wall time (measured in its worker); queueing time is not the run's.
        progress.done(result, result.sim?.wall_s ?? (performance.now() - started) / 1000);
      }),
    );
  } finally {
    progress.stop();
    await pool.close();
  }
  return pairs.map((pair) => results.get(pair.key) as RunResult);
}

export function countStatuses(runs: readonly RunResult[]): Record<'pass' | 'fail' | 'error', number> {
  const counts = { pass: 0, fail: 0, error: 0 };
  for (const r of runs) counts[r.status]++;
  return counts;
}

function readSavedRuns(runsDir: string): Map<string, RunResult> {
  const saved = new Map<string, RunResult>();
  for (const name of readdirSync(runsDir)) {
    if (!name.endsWith('.json') || name.startsWith('.')) continue;
    try {
      saved.set(name.slice(0, -'.json'.length), JSON.parse(readFileSync(path.join(runsDir, name), 'utf8')) as RunResult);
    } catch {
      // An unreadable saved run is simply run again.
    }
  }
  return saved;
}

function clearSavedRuns(runsDir: string): void {
  for (const name of readdirSync(runsDir)) if (name.endsWith('.json')) rmSync(path.join(runsDir, name), { force: true });
}
