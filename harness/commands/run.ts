// `footing run`: every (scenario × build) pair of a suite through the suite runner (run/suite.ts),
// then (runTail.ts, loaded while the runs run) the results folder: results.json, junit.xml,
// summary.md, report.html, and gate.md when a baseline build is named. Exit 0 every run passes
// (and the gate holds), 1 otherwise, 2 bad input.

import path from 'node:path';
import { observationRequest, timedScenarios } from '../bench/pairedLoopTime.js';
import { warmLoopTimeThread } from '../bench/suiteLoopTime.js';
import type { PackedObservations } from '../contract/packed.js';
import type { BuildSpec } from '../builds/spec.js';
import { describeOrigin, type RunFlags } from '../config/resolve.js';
import { defaultPolicy, type GatePolicy } from '../gate/defaults.js';
import { loadPolicy } from '../gate/policy.js';
import { defaultJobs, warmRunThreads, type RunTimeout } from '../run/pool.js';
import { buildManifests, type PreparedBuild } from '../run/prepare.js';
import { resolveShard, ShardSpecError, type ShardSpec } from '../run/shard.js';
import { SIGNAL_EXIT } from '../run/interrupt.js';
import { lockOutputFolder, OutputFolderError } from '../run/outputLock.js';
import { runPairs, SuiteInterruptedError } from '../run/suite.js';
import { resolveForCommand } from './config.js';
import { prepareConfiguredBuilds } from './gitBuilds.js';
import { EXIT } from './exit.js';
import type { SuiteRunOptions, SuiteRunOutcome } from './runTypes.js';
import { isOutcome, prepareBuildSpecs, prepareScenarioList, startCommand } from './skeleton.js';

export type { PreparedBuild } from '../run/prepare.js';

export type { SuiteRunOptions, SuiteRunOutcome } from './runTypes.js';

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
  const running = runPairs({
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
  // What follows the runs (gate, loop time, report) loads while they run: off the start's path.
  const tail = import('./runTail.js');
  // Runs that throw (a signal) leave the import unawaited: its failure must not surface later.
  tail.catch(() => undefined);
  const runs = await running;

  const { finishSuite } = await tail;
  return finishSuite({ out, options, cwd, outDir, policy, scenarios, specs, prepared, manifests, startedAt, runs, shard, observed, writtenSeries, timesLoop });
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

/**
 * Starts the run threads (and the loop-time thread) before the scenarios load, when the suite is
 * sure to use them: more than one job and more than one build, so at least one pair per build (a
 * single pair runs in this thread); not for a resumed or sharded suite, which may run fewer.
 * Their start-up then overlaps the loading instead of following it.
 */
function warmThreads(specs: readonly BuildSpec[], options: SuiteRunOptions, policy: GatePolicy): void {
  const jobs = options.jobs ?? defaultJobs();
  if (jobs < 2 || specs.length < 2 || options.resume || options.shard) return;
  warmRunThreads(Math.min(jobs, specs.length));
  const inThread = specs.every((spec) => spec.kind !== 'process');
  if (options.baseline !== undefined && loopTimeJudged(policy) && inThread) warmLoopTimeThread();
}

function loopTimeJudged(policy: GatePolicy): boolean {
  return policy.rules.loopTimeSlowdownFraction !== null || policy.rules.allowLoopTimeOverBudget === false;
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
