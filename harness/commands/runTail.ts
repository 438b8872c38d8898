// What `footing run` does after its runs (runTail, imported while the runs run, so that none of
// it delays their start): the results file, `run --bench`, the gate's loop-time measurement, the
// gate, the results folder's files (commands/outputs.ts) and the closing lines.

import { createHash } from 'node:crypto';
import path from 'node:path';
import { attachBench } from '../bench/attach.js';
import { DEFAULT_BENCH_SCENARIO } from '../bench/defaults.js';
import { runBench } from '../bench/run.js';
import { measureSuiteLoopTimes, measureSuiteLoopTimesInThread, timeableInThread } from '../bench/suiteLoopTime.js';
import type { BuildSpec } from '../builds/spec.js';
import type { PackedObservations } from '../contract/packed.js';
import { writeFileAtomicSync } from '../files/atomic.js';
import { formatIssue } from '../files/issue.js';
import type { GatePolicy } from '../gate/defaults.js';
import { gateWithinResults } from '../gate/gate.js';
import { renderGateMarkdown, verdictLine } from '../gate/render.js';
import { prepareScenarioPlots, type PreparedPlots } from '../report/model.js';
import { gateDivergences, renderDivergenceMarkdown } from '../results/divergence.js';
import type { PairedLoopTimeRecord } from '../results/loopTime.js';
import { createResultsFile, firstReason } from '../results/runResult.js';
import type { BuildManifest, ResultsFile, RunResult, ShardRecord } from '../results/types.js';
import { defaultJobs } from '../run/pool.js';
import type { PreparedBuild } from '../run/prepare.js';
import type { ShardSpec } from '../run/shard.js';
import { countStatuses } from '../run/suite.js';
import { loadScenarioFile } from '../scenario/load.js';
import type { ResolvedScenario } from '../scenario/types.js';
import { TOOL_VERSION } from '../version.js';
import { EXIT, exitCodeOfRuns, type ExitCode } from './exit.js';
import { aheadLine, OUTPUT_FILES, writeOutputs } from './outputs.js';
import type { SuiteRunOptions, SuiteRunOutcome } from './runTypes.js';
import type { startCommand } from './skeleton.js';

/** Time per bench task with `run --bench`: shorter than `footing bench`, enough for the gate's ±30 %. */
const SUITE_BENCH_TIME_ms = 400;

/** What the runs left for the tail. */
export interface SuiteTail {
  out: ReturnType<typeof startCommand>;
  options: SuiteRunOptions;
  cwd: string;
  outDir: string;
  policy: GatePolicy;
  scenarios: ResolvedScenario[];
  specs: BuildSpec[];
  prepared: Map<string, PreparedBuild>;
  manifests: BuildManifest[];
  startedAt: Date;
  runs: RunResult[];
  shard: ShardSpec | undefined;
  /** What the baseline's runs kept for the loop-time measurement, by scenario id. */
  observed: Map<string, PackedObservations>;
  writtenSeries: Set<string>;
  /** Whether the policy judges loop time (and a baseline is named). */
  timesLoop: boolean;
}

export async function finishSuite(tail: SuiteTail): Promise<SuiteRunOutcome> {
  const { out, options, cwd, outDir, policy, scenarios, specs, prepared, manifests, startedAt, runs, shard, observed, writtenSeries, timesLoop } = tail;
  const log = out.log;
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
