// `footing run`: every (scenario × build) pair of a suite, in parallel on worker threads, with
// results in a deterministic order whatever the parallelism. Each finished pair is saved at once
// (runs/<key>.json, atomically), so a killed run leaves no truncated file and --resume picks up
// where it stopped; the folder's summary files are assembled from those at the end.

import { mkdirSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import path from 'node:path';
import { buildManifest } from '../builds/provenance.js';
import type { BuildSpec } from '../builds/spec.js';
import { gateWithinResults } from '../gate/gate.js';
import { loadPolicy } from '../gate/policy.js';
import { defaultPolicy, type GatePolicy } from '../gate/defaults.js';
import { renderGateMarkdown } from '../gate/render.js';
import type { ResolvedScenario } from '../scenario/types.js';
import { TOOL_VERSION } from '../version.js';
import { removeStaleTemps, writeFileAtomicSync } from './atomic.js';
import { OUTPUT_FILES, writeOutputs } from './outputs.js';
import { createRunPool, RunTimeoutError } from './pool.js';
import { chooseProgressMode, createProgress } from './progress.js';
import { createErrorRunResult, createResultsFile } from './results/runResult.js';
import type { BuildManifest, ResultsFile, RunResult } from './results/types.js';
import { attachBench } from '../bench/attach.js';
import { DEFAULT_BENCH_SCENARIO } from '../bench/command.js';
import { runBench } from '../bench/run.js';
import { formatIssue, loadScenarioFile } from '../scenario/index.js';
import { prepareBuilds, prepareScenarios } from './prepare.js';
import { parseShard, shardIndices, ShardSpecError } from './shard.js';
import { gateDivergences, renderDivergenceMarkdown } from '../recorded/divergence.js';

export const EXIT = { pass: 0, fail: 1, badInput: 2, internal: 3 } as const;
export type ExitCode = (typeof EXIT)[keyof typeof EXIT];

export { DEFAULT_SCENARIO_PATHS } from './prepare.js';
export const RUNS_FOLDER = 'runs';
/** Time per bench task with `run --bench`: shorter than `footing bench`, enough for the gate's ±30 %. */
const SUITE_BENCH_TIME_ms = 400;

/**
 * A build resolved before the suite (e.g. from a git ref, harness/builds/git.ts): its spec, the
 * manifest fields to record for it, or why it could not be prepared — then each of its runs is an
 * `error` run carrying that message and output tail, and the other builds run as usual.
 */
export interface PreparedBuild {
  spec: BuildSpec;
  manifest?: Record<string, unknown>;
  failure?: { message: string; outputTail: string };
}

export interface SuiteRunOptions {
  paths?: string[];
  /** Spec texts (`--build`) or builds prepared elsewhere, in the order results list them. */
  builds: (string | PreparedBuild)[];
  /** Replaces every scenario's control.loopBudget_us (a machine's budget, not the scenario's content). */
  loopBudget_us?: number;
  outDir: string;
  trace?: boolean;
  traceEveryNth?: number;
  jobs?: number;
  shard?: string;
  baseline?: string;
  policyFile?: string;
  /** A policy already loaded (e.g. inline in footing.config.yaml); policyFile wins when both are given. */
  policy?: GatePolicy;
  resume?: boolean;
  quiet?: boolean;
  /** Measure every build with the bench (governor rate, tick time, real-time factor) and attach it. */
  bench?: boolean;
  /** Wall-clock allowance of one run: base + factor × simulated duration (seconds). */
  runTimeout?: { base_s: number; perSimulatedSecond: number };
  cwd?: string;
  log?: (line: string) => void;
}

export interface SuiteRunOutcome {
  exitCode: ExitCode;
  results?: ResultsFile;
  /** Lines for the person at the terminal (also passed to `log` as they happen). */
  lines: string[];
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

export async function runSuite(options: SuiteRunOptions): Promise<SuiteRunOutcome> {
  const lines: string[] = [];
  const log = (line: string) => {
    lines.push(line);
    options.log?.(line);
  };
  const cwd = options.cwd ?? process.cwd();
  const badInput = (message: string): SuiteRunOutcome => {
    log(message);
    return { exitCode: EXIT.badInput, lines };
  };

  // Builds.
  const prepared = new Map<string, PreparedBuild>();
  const parsed = prepareBuilds(
    'run',
    options.builds.map((item) => {
      if (typeof item === 'string') return item;
      prepared.set(item.spec.name, item);
      return item.spec;
    }),
    cwd,
  );
  if (!parsed.ok) return badInput(parsed.lines.join('\n'));
  const specs = parsed.value;
  const names = new Set(specs.map((spec) => spec.name));
  if (options.baseline !== undefined && !names.has(options.baseline)) {
    return badInput(`--baseline ${options.baseline}: no build of that name (builds: ${[...names].join(', ')})`);
  }
  let policy: GatePolicy = options.policy ?? defaultPolicy();
  if (options.policyFile) {
    try {
      policy = loadPolicy(path.resolve(cwd, options.policyFile));
    } catch (error) {
      return badInput((error as Error).message);
    }
  }

  // Scenarios, in the canonical order (prepare.ts): by file then id; builds as given.
  const loaded = await prepareScenarios('run', options.paths, cwd);
  if (!loaded.ok) {
    for (const line of loaded.lines) log(line);
    return { exitCode: EXIT.badInput, lines };
  }
  for (const line of loaded.warnings) log(line);
  const scenarios = loaded.value;
  if (options.loopBudget_us !== undefined) {
    for (const scenario of scenarios) scenario.control.loopBudget_us = options.loopBudget_us;
  }

  let pairs: Pair[] = [];
  for (const scenario of scenarios) {
    for (const build of specs) pairs.push({ scenario, build, key: pairKey(scenario.id, build.name) });
  }
  if (options.shard) {
    try {
      const shard = parseShard(options.shard);
      const mine = shardIndices(pairs.map((p) => p.scenario.duration_s), shard);
      pairs = mine.map((i) => pairs[i]);
    } catch (error) {
      if (error instanceof ShardSpecError) return badInput(error.message);
      throw error;
    }
  }

  const outDir = path.resolve(cwd, options.outDir);
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
  if (options.resume) log(`resuming: ${results.size} of ${pairs.length} runs already complete in ${options.outDir}`);

  const manifests: BuildManifest[] = await Promise.all(
    specs.map(async (spec) => {
      const given = prepared.get(spec.name);
      if (given?.manifest) return { name: spec.name, ...given.manifest };
      if (given?.failure) return { name: spec.name, kind: spec.kind, entry: spec.entry, commit: null, dirty: null };
      const manifest = await buildManifest(spec);
      return { ...manifest, commit: manifest.git?.commit ?? null, dirty: manifest.git?.dirty ?? null };
    }),
  );
  const startedAt = new Date();
  const jobs = Math.max(1, Math.min(options.jobs ?? defaultJobs(), pending.length || 1));
  const progress = createProgress(chooseProgressMode({ quiet: options.quiet }), pending.length, log);
  const timeout = options.runTimeout ?? { base_s: 120, perSimulatedSecond: 30 };
  const pool = createRunPool(jobs);
  try {
    await Promise.all(
      pending.map(async (pair) => {
        const started = performance.now();
        let result: RunResult;
        const failure = prepared.get(pair.build.name)?.failure;
        if (failure) {
          result = createErrorRunResult(pair.scenario, pair.build.name, { message: failure.message, reason: 'build-failed', stderrTail: failure.outputTail });
        } else {
          try {
            result = await pool.run(
              { scenario: pair.scenario, build: pair.build, outDir, trace: options.trace ?? false, traceEveryNth: options.traceEveryNth },
              timeout.base_s + timeout.perSimulatedSecond * pair.scenario.duration_s,
            );
          } catch (error) {
            const reason = error instanceof RunTimeoutError ? 'run-timeout' : 'worker';
            result = createErrorRunResult(pair.scenario, pair.build.name, { message: (error as Error).message, reason });
          }
        }
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

  const ordered = pairs.map((pair) => results.get(pair.key) as RunResult);
  let resultsFile = createResultsFile({ toolVersion: TOOL_VERSION, builds: manifests, startedAt, runs: ordered });
  if (options.bench) resultsFile = await benchSuiteBuilds(resultsFile, specs.filter((spec) => !prepared.get(spec.name)?.failure), log);
  // The gate runs first so that the report shows the gate's own regression list.
  const gateOutcome = options.baseline !== undefined ? gateWithinResults(resultsFile, options.baseline, policy) : undefined;
  writeOutputs(outDir, resultsFile, { baseline: options.baseline, gate: gateOutcome, policy });

  let exitCode: ExitCode = ordered.every((r) => r.status === 'pass') ? EXIT.pass : EXIT.fail;
  const counts = countStatuses(ordered);
  log(`${ordered.length} runs: ${counts.pass} pass, ${counts.fail} fail, ${counts.error} error — ${path.relative(cwd, outDir) || '.'}/${OUTPUT_FILES.report}`);
  if (gateOutcome) {
    // First divergence of the traces (harness/recorded/divergence.ts), when the runs kept traces.
    const resultsRef = { file: path.join(outDir, OUTPUT_FILES.results), results: resultsFile };
    const divergences = options.trace ? gateDivergences(resultsRef, resultsRef, gateOutcome.buildPairs) : [];
    writeFileAtomicSync(path.join(outDir, OUTPUT_FILES.gate), renderGateMarkdown(gateOutcome) + renderDivergenceMarkdown(divergences));
    log(`gate against ${options.baseline}: ${gateOutcome.verdict === 'hold' ? 'holds' : 'BLOCKS'} (${path.relative(cwd, path.join(outDir, OUTPUT_FILES.gate))})`);
    if (gateOutcome.verdict === 'block') exitCode = EXIT.fail;
  }
  return { exitCode, results: resultsFile, lines };
}

export function defaultJobs(): number {
  return Math.max(1, availableParallelism());
}

/** `run --bench`: the bench figures of every build on the standard bench scenario, attached to the results. */
async function benchSuiteBuilds(results: ResultsFile, specs: BuildSpec[], log: (line: string) => void): Promise<ResultsFile> {
  const loaded = await loadScenarioFile(DEFAULT_BENCH_SCENARIO);
  if (!loaded.ok) throw new Error(`bench scenario ${DEFAULT_BENCH_SCENARIO} does not load: ${loaded.errors.map(formatIssue).join('; ')}`);
  log(`bench: ${specs.length} builds on ${loaded.scenarios[0].id} (governor rate, tick time, real-time factor)`);
  const report = await runBench({ scenario: loaded.scenarios[0], builds: specs, time_ms: SUITE_BENCH_TIME_ms });
  return attachBench(results, report);
}

function countStatuses(runs: RunResult[]): Record<'pass' | 'fail' | 'error', number> {
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
