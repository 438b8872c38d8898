// `footing run`: every (scenario × build) pair of a suite through the suite runner (run/suite.ts),
// then the results folder: results.json, junit.xml, summary.md, report.html, and gate.md when a
// baseline build is named. Exit 0 every run passes (and the gate holds), 1 otherwise, 2 bad input.

import { createHash } from 'node:crypto';
import path from 'node:path';
import { attachBench } from '../bench/attach.js';
import { observationRequest, timedScenarios } from '../bench/pairedLoopTime.js';
import { measureSuiteLoopTimes, measureSuiteLoopTimesInThread, timeableInThread, warmLoopTimeThread } from '../bench/suiteLoopTime.js';
import type { PackedObservations } from '../contract/packed.js';
import { DEFAULT_BENCH_SCENARIO } from '../bench/defaults.js';
import { runBench } from '../bench/run.js';
import type { BuildSpec } from '../builds/spec.js';
import { describeOrigin, itemLabel, type RunFlags } from '../config/resolve.js';
import { writeFileAtomicSync } from '../files/atomic.js';
import { formatIssue } from '../files/issue.js';
import { defaultPolicy, type GatePolicy } from '../gate/defaults.js';
import { gateWithinResults } from '../gate/gate.js';
import { loadPolicy } from '../gate/policy.js';
import { renderGateMarkdown, verdictLine } from '../gate/render.js';
import { gateDivergences, renderDivergenceMarkdown } from '../results/divergence.js';
import type { PairedLoopTimeRecord } from '../results/loopTime.js';
import { createResultsFile, firstReason } from '../results/runResult.js';
import type { ResultsFile, RunResult, ShardRecord } from '../results/types.js';
import type { ResolvedScenario } from '../scenario/types.js';
import { defaultJobs, warmRunThreads, type RunTimeout } from '../run/pool.js';
import { buildManifests, type PreparedBuild } from '../run/prepare.js';
import { resolveShard, ShardSpecError, type ShardSpec } from '../run/shard.js';
import { SIGNAL_EXIT } from '../run/interrupt.js';
import { lockOutputFolder, OutputFolderError } from '../run/outputLock.js';
import { countStatuses, runPairs, SuiteInterruptedError } from '../run/suite.js';
import { loadScenarioFile } from '../scenario/load.js';
import { TOOL_VERSION } from '../version.js';
import { resolveForCommand } from './config.js';
import { prepareConfiguredBuilds } from './gitBuilds.js';
import { EXIT, exitCodeOfRuns, type ExitCode } from './exit.js';
import { aheadLine, OUTPUT_FILES, writeOutputs } from './outputs.js';
import { prepareScenarioPlots, type PreparedPlots } from '../report/model.js';
import { isOutcome, prepareBuildSpecs, prepareScenarioList, startCommand, type CommandOutcome, type SuiteCommandOptions } from './skeleton.js';

export type { PreparedBuild } from '../run/prepare.js';

/** Time per bench task with `run --bench`: shorter than `footing bench`, enough for the gate's ±30 %. */
const SUITE_BENCH_TIME_ms = 400;

export interface SuiteRunOptions extends SuiteCommandOptions {
  /** Spec texts (`--build`) or builds prepared elsewhere, in the order results list them. */
  builds: (string | PreparedBuild)[];
  /** Replaces every scenario's control.loopBudget_us (a machine's budget, not the scenario's content). */
  loopBudget_us?: number;
  trace?: boolean;
  traceEveryNth?: number;
  /** K/N, or `auto`: from the CI matrix or job array's environment (run/shard.ts). */
  shard?: string;
  /** The count for `--shard auto` where the scheduler gives only the index (Kubernetes). */
  shardCount?: number;
  /** The environment `--shard auto` reads (default process.env). */
  env?: Readonly<Record<string, string | undefined>>;
  baseline?: string;
  policyFile?: string;
  /** A policy already loaded (e.g. inline in footing.config.yaml); policyFile wins when both are given. */
  policy?: GatePolicy;
  resume?: boolean;
  quiet?: boolean;
  /** Measure every build with the bench (governor rate, tick time, real-time factor) and attach it. */
  bench?: boolean;
}

export interface SuiteRunOutcome extends CommandOutcome {
  results?: ResultsFile;
}

/** `footing run` without the config file: the builds and settings as given. */
export async function runSuite(options: SuiteRunOptions): Promise<SuiteRunOutcome> {
  const out = startCommand(options.log);
  const log = out.log;
  const cwd = options.cwd ?? process.cwd();

  const prepared = new Map<string, PreparedBuild>();
  const specs = prepareBuildSpecs(
    out,
    'run',
    options.builds.map((item) => {
      if (typeof item === 'string') return item;
      prepared.set(item.spec.name, item);
      return item.spec;
    }),
    cwd,
    new Set([...prepared.values()].filter((item) => item.manifest !== undefined || item.failure !== undefined).map((item) => item.spec.name)),
  );
  if (isOutcome(specs)) return specs;
  const names = new Set(specs.map((spec) => spec.name));
  if (options.baseline !== undefined && !names.has(options.baseline)) {
    return out.badInput(`--baseline ${options.baseline}: no build of that name (builds: ${[...names].join(', ')})`);
  }
  let policy: GatePolicy = options.policy ?? defaultPolicy();
  if (options.policyFile) {
    try {
      policy = loadPolicy(path.resolve(cwd, options.policyFile));
    } catch (error) {
      return out.badInput((error as Error).message);
    }
  }

  warmThreads(specs, options, policy);
  const scenarios = await prepareScenarioList(out, 'run', options.paths, cwd, options.selection);
  if (isOutcome(scenarios)) return scenarios;
  if (options.loopBudget_us !== undefined) {
    for (const scenario of scenarios) scenario.control.loopBudget_us = options.loopBudget_us;
  }
  let shard: ShardSpec | undefined;
  if (options.shard) {
    try {
      shard = resolveShard(options.shard, { env: options.env ?? process.env, count: options.shardCount });
    } catch (error) {
      if (error instanceof ShardSpecError) return out.badInput(error.message);
      throw error;
    }
  }

  const outDir = path.resolve(cwd, options.outDir);
  // One writer per results folder: a second run into it is refused before anything is run.
  let releaseLock: () => void;
  try {
    releaseLock = lockOutputFolder(outDir, log);
  } catch (error) {
    if (error instanceof OutputFolderError) return out.badInput(error.message);
    throw error;
  }
  const runLocked = async (): Promise<SuiteRunOutcome> => {
  const manifests = await buildManifests(specs, prepared);
  const startedAt = new Date();
  const writtenSeries = new Set<string>();
  // The gate's loop-time timing reuses what the baseline observed in its own suite runs.
  const timesLoop = options.baseline !== undefined && loopTimeJudged(policy);
  const observed = new Map<string, PackedObservations>();
  const observe = timesLoop
    ? { build: options.baseline!, requests: new Map(timedScenarios(scenarios).map((s) => [s.id, observationRequest(s)])), onObserved: (id: string, o: PackedObservations) => observed.set(id, o) }
    : undefined;
  const runs = await runPairs({
    writtenSeries,
    observe,
    scenarios,
    builds: specs,
    prepared,
    outDir,
    trace: options.trace,
    traceEveryNth: options.traceEveryNth,
    jobs: options.jobs,
    shard,
    resume: options.resume,
    quiet: options.quiet,
    runTimeout: options.runTimeout,
    outLabel: options.outDir,
    log,
  });

  let resultsFile = createResultsFile({ toolVersion: TOOL_VERSION, builds: manifests, startedAt, runs });
  if (shard) resultsFile = { ...resultsFile, shard: shardRecord(shard, scenarios, specs) };
  if (options.bench) resultsFile = await benchSuiteBuilds(resultsFile, specs.filter((spec) => !prepared.get(spec.name)?.failure), log);
  let preparedPlots: PreparedPlots | undefined;
  if (options.baseline !== undefined && timesLoop) {
    const started = await startLoopTimes(scenarios, specs, prepared, options.baseline, options.jobs ?? defaultJobs(), log, observed);
    // The plots do not depend on the gate: drawn while the loop time is being timed (if in a thread).
    preparedPlots = prepareScenarioPlots(resultsFile, { baseline: options.baseline, outDir, scenarios, writtenSeries });
    const loopTime = await started.records;
    if (loopTime.length > 0) resultsFile = { ...resultsFile, loopTime };
  }
  // The gate runs first so that the report shows the gate's own regression list.
  const gateOutcome = options.baseline !== undefined ? gateWithinResults(resultsFile, options.baseline, policy, undefined, resultsFile.loopTime) : undefined;
  writeOutputs(outDir, resultsFile, { baseline: options.baseline, gate: gateOutcome, policy, scenarios, writtenSeries, preparedPlots });

  // With a baseline the gate decides: a run failing on both sides is inherited, not a block.
  const exitCode: ExitCode = gateOutcome ? (gateOutcome.verdict === 'block' ? EXIT.fail : EXIT.pass) : exitCodeOfRuns(runs);
  const counts = countStatuses(runs);
  log(`${runs.length} runs: ${counts.pass} pass, ${counts.fail} fail, ${counts.error} error — ${path.relative(cwd, outDir) || '.'}/${OUTPUT_FILES.report}`);
  for (const line of failingSummary(runs)) log(line);
  const ahead = aheadLine(resultsFile, options.baseline, policy);
  if (ahead !== null) log(`${ahead} (${OUTPUT_FILES.summary}, docs/scoring.md)`);
  if (gateOutcome) {
    // First divergence of the traces (results/divergence.ts), when the runs kept traces.
    const resultsRef = { file: path.join(outDir, OUTPUT_FILES.results), results: resultsFile };
    const divergences = options.trace ? gateDivergences(resultsRef, resultsRef, gateOutcome.buildPairs) : [];
    writeFileAtomicSync(path.join(outDir, OUTPUT_FILES.gate), renderGateMarkdown(gateOutcome) + renderDivergenceMarkdown(divergences));
    log(`gate against ${options.baseline}: ${verdictLine(gateOutcome)} (${path.relative(cwd, path.join(outDir, OUTPUT_FILES.gate))})`);
  }
  return { ...out.finish(exitCode), results: resultsFile };
  };
  try {
    return await runLocked();
  } catch (error) {
    if (error instanceof OutputFolderError) return out.badInput(error.message);
    if (error instanceof SuiteInterruptedError) {
      log(error.message);
      return out.finish(SIGNAL_EXIT[error.signal]);
    }
    throw error;
  } finally {
    releaseLock();
  }
}

/** Which share of which suite a shard ran: `footing merge` refuses missing, doubled or mixed shards. */
function shardRecord(shard: ShardSpec, scenarios: readonly ResolvedScenario[], specs: readonly BuildSpec[]): ShardRecord {
  const hash = createHash('sha256');
  let pairs = 0;
  for (const scenario of scenarios) {
    for (const spec of specs) {
      hash.update(`${scenario.id}\u0000${scenario.hash}\u0000${spec.name}\n`);
      pairs++;
    }
  }
  return { index: shard.index, count: shard.count, suite: hash.digest('hex'), pairs };
}

/** Failing pairs listed with their first reason, at most this many (the rest in summary.md). */
const MAX_FAILING_LINES = 20;

function failingSummary(runs: readonly RunResult[]): string[] {
  const failing = runs.filter((r) => r.status !== 'pass');
  if (failing.length === 0) return [];
  const lines = failing.slice(0, MAX_FAILING_LINES).map((r) => `  ${r.status} ${r.scenario.id} × ${r.build}: ${firstReason(r)}`);
  if (failing.length > MAX_FAILING_LINES) lines.push(`  … and ${failing.length - MAX_FAILING_LINES} more in summary.md`);
  return [`not passing (${failing.length}):`, ...lines];
}

/**
 * Starts the run threads (and the loop-time thread) before the scenarios load, when the suite is
 * sure to use them: more than one job and more than one build, so more than one pair (a single
 * pair runs in this thread). Their start-up then overlaps the loading instead of following it.
 */
function warmThreads(specs: readonly BuildSpec[], options: SuiteRunOptions, policy: GatePolicy): void {
  const jobs = options.jobs ?? defaultJobs();
  if (jobs < 2 || specs.length < 2 || options.resume) return;
  warmRunThreads(Math.min(jobs, specs.length * 2));
  const inThread = specs.every((spec) => spec.kind !== 'process');
  if (options.baseline !== undefined && loopTimeJudged(policy) && inThread) warmLoopTimeThread();
}

function loopTimeJudged(policy: GatePolicy): boolean {
  return policy.rules.loopTimeSlowdownFraction !== null || policy.rules.allowLoopTimeOverBudget === false;
}

/**
 * The gate's loop-time measurement (bench/suiteLoopTime.ts) of the usable builds, started: in a
 * thread of its own when there is more than one job and every build runs in-process, so that this
 * thread can draw the report's plots meanwhile; else here, finished before it returns.
 */
async function startLoopTimes(
  scenarios: readonly ResolvedScenario[],
  specs: readonly BuildSpec[],
  prepared: Map<string, PreparedBuild>,
  baselineName: string,
  jobs: number,
  log: (line: string) => void,
  observed: ReadonlyMap<string, PackedObservations>,
): Promise<{ records: Promise<PairedLoopTimeRecord[]> }> {
  const usable = specs.filter((spec) => !prepared.get(spec.name)?.failure);
  const baseline = usable.find((spec) => spec.name === baselineName);
  if (baseline === undefined) return { records: Promise.resolve([]) };
  const input = { scenarios, baseline, candidates: usable.filter((spec) => spec.name !== baselineName), observed };
  if (jobs > 1 && timeableInThread(input)) return { records: measureSuiteLoopTimesInThread(input, log) };
  const records = await measureSuiteLoopTimes(input, log);
  return { records: Promise.resolve(records) };
}

/** `run --bench`: the bench figures of every build on the standard bench scenario, attached to the results. */
async function benchSuiteBuilds(results: ResultsFile, specs: BuildSpec[], log: (line: string) => void): Promise<ResultsFile> {
  const loaded = await loadScenarioFile(DEFAULT_BENCH_SCENARIO);
  if (!loaded.ok) throw new Error(`bench scenario ${DEFAULT_BENCH_SCENARIO} does not load: ${loaded.errors.map(formatIssue).join('; ')}`);
  log(`bench: ${specs.length} builds on ${loaded.scenarios[0].id} (governor rate, tick time, real-time factor)`);
  const report = await runBench({ scenario: loaded.scenarios[0], builds: specs, time_ms: SUITE_BENCH_TIME_ms });
  return attachBench(results, report);
}

export interface ConfiguredRunOptions {
  /** Called with each line as it happens (progress, build steps); lines are returned too. */
  log?: (line: string) => void;
  /** Passed to runSuite (tests shorten it). */
  runTimeout?: RunTimeout;
  /** `--exit-zero`: exit 0 even when runs fail or the gate blocks (still 2 on bad input). */
  exitZero?: boolean;
}

/**
 * `footing run` with the config file: resolves the settings, builds every git-ref build (from the
 * cache when its commit was built before), then runs the suite. Bad input — config errors, an
 * unknown suite or build, a ref that names no commit — is exit 2 with nothing run; a build command
 * that fails or leaves no entry makes that build's runs `error` runs (exit 1), the rest still run.
 */
export async function runConfiguredSuite(flags: RunFlags, options: ConfiguredRunOptions = {}): Promise<SuiteRunOutcome> {
  const out = startCommand(options.log);
  const log = out.log;
  const resolved = resolveForCommand(flags);
  if (!resolved.ok) return out.badInput(...resolved.lines, 'footing run: nothing was run; fix the configuration above (footing config --print shows what was resolved)');
  const settings = resolved.settings;

  const git = await prepareConfiguredBuilds(settings.builds, log);
  if (!git.ok) return out.badInput(...git.lines, 'footing run: nothing was run; fix the refs above');
  const prepared = git.prepared;
  if (settings.bench.value) log(`bench: on (${describeOrigin(settings.bench.origin)}); figures attached to results.json`);

  const outcome = await runSuite({
    paths: settings.paths.value,
    selection: settings.selection,
    builds: prepared,
    outDir: settings.out.value,
    trace: settings.trace.value,
    jobs: settings.jobs.value,
    shard: flags.shard,
    shardCount: flags.shardCount,
    baseline: settings.baseline.value,
    policyFile: settings.policy.value.file,
    policy: settings.policy.value.inline,
    loopBudget_us: settings.loopBudget_us.value,
    resume: flags.resume,
    quiet: flags.quiet,
    bench: settings.bench.value,
    runTimeout: options.runTimeout,
    cwd: settings.cwd,
    log,
  });
  const exitCode = outcome.exitCode === EXIT.fail && options.exitZero ? EXIT.pass : outcome.exitCode;
  return { exitCode, lines: out.lines, results: outcome.results };
}
