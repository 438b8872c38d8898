// `footing margin`: for every (scenario × build) pair, the critical friction scale (smallest factor
// on every material's friction at which acceptance still holds) and the critical push scale
// (largest factor on every push's force it survives). Pairs run concurrently on the worker pool;
// each pair's probes run one after another, because each bisection step needs the last outcome.

import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { buildManifest } from '../builds/provenance.js';
import type { BuildSpec } from '../builds/spec.js';
import { createRunPool, RunTimeoutError, type RunPool } from '../run/pool.js';
import { createErrorRunResult, createResultsFile } from '../results/runResult.js';
import type { BuildManifest, ResultsFile, RunResult } from '../results/types.js';
import { writeFileAtomicSync } from '../files/atomic.js';
import { OUTPUT_FILES, writeOutputs } from '../commands/outputs.js';
import { prepareBuilds, prepareScenarios } from '../run/prepare.js';
import { EXIT, defaultJobs, type ExitCode } from '../run/suite.js';
import type { ResolvedScenario } from '../scenario/types.js';
import { lowestStaticFriction, peakPushForce_N, scaleFriction, scalePushes } from '../scenario/variation.js';
import { TOOL_VERSION } from '../version.js';
import { renderMarginLines, renderMarginMarkdown } from './render.js';
import { searchBoundary, type SearchOptions, type SearchResult } from './search.js';
import type { FrictionMarginRecord, MarginSample, MarginSearchRecord, PushMarginRecord, RunMargin } from '../results/margin.js';

/**
 * Search settings, the one place these defaults live. Tolerance 0.01 of the scenario's own
 * friction is finer than the spread of friction between two mops of one floor (common practice).
 * Friction is searched down to 0.05 × (below wet ice for any floor of μs ≤ 1, from memory) or up
 * to 3 ×; pushes from 0 (no push) to 3 × the written shove. Two checks plus the two ends are the
 * monotonicity samples: 11 runs for friction and 12 for pushes (the nominal run is shared).
 */
export const MARGIN_DEFAULTS = Object.freeze({
  tolerance: 0.01,
  frictionRange: [0.05, 3] as readonly [number, number],
  pushRange: [0, 3] as readonly [number, number],
  checks: 2,
});

export const MARGIN_REPORT_NAME = 'margin.md';

export type MarginQuantity = 'friction' | 'push';

export interface MarginRunOptions {
  paths?: string[];
  builds: string[];
  outDir: string;
  jobs?: number;
  tolerance?: number;
  frictionRange?: readonly [number, number];
  pushRange?: readonly [number, number];
  checks?: number;
  /** Which searches to run (default both). */
  quantities?: readonly MarginQuantity[];
  /** Wall-clock allowance of one run: base + factor × simulated duration (seconds). */
  runTimeout?: { base_s: number; perSimulatedSecond: number };
  cwd?: string;
  log?: (line: string) => void;
}

export interface MarginRunOutcome {
  exitCode: ExitCode;
  results?: ResultsFile;
  lines: string[];
}

type Runner = (scenario: ResolvedScenario, outDir: string) => Promise<RunResult>;

function sampleOf(scale: number, result: RunResult): { status: RunResult['status']; detail: Omit<MarginSample, 'scale' | 'status' | 'role'> } {
  return {
    status: result.status,
    detail: {
      slipDistance_m: result.metrics?.slipDistance_m ?? null,
      frictionMarginMin: result.metrics?.frictionMargin.min ?? null,
      fell: result.metrics?.fell ?? null,
      reasons: result.status === 'pass' ? [] : result.reasons,
    },
  };
}

function record(search: SearchResult<Omit<MarginSample, 'scale' | 'status' | 'role'>>, wall_s: number): MarginSearchRecord {
  return {
    outcome: search.outcome,
    criticalScale: search.critical,
    bracket: search.bracket,
    range: search.range,
    tolerance: search.tolerance,
    monotone: search.monotone,
    runs: search.runs,
    bisectionRuns: search.bisectionRuns,
    wall_s,
    samples: search.samples.map((s) => ({ scale: s.scale, status: s.status, role: s.role, ...s.detail })),
  };
}

/**
 * Both searches of one pair. The run at the scenario's own friction and push is the pair's result
 * in results.json (original id and hash, so the gate pairs it as usual) and is shared by the two
 * searches; the other probes are scenario variations with derived ids.
 */
export async function searchPair(
  scenario: ResolvedScenario,
  run: Runner,
  dirs: { outDir: string; scratchDir: string },
  settings: { tolerance: number; frictionRange: readonly [number, number]; pushRange: readonly [number, number]; checks: number; quantities: readonly MarginQuantity[] },
): Promise<RunResult> {
  const nominal = await run(scenario, dirs.outDir);
  const notes: string[] = [];
  const margin: RunMargin = { friction: null, push: null, notes };
  if (nominal.status === 'error') {
    notes.push(`no margin search: the run at the scenario's own friction and push errored (${nominal.error?.message ?? nominal.reasons.join('; ')})`);
    return { ...nominal, margin };
  }
  const probeWith = (vary: (s: ResolvedScenario, factor: number) => ResolvedScenario) => async (scale: number) =>
    sampleOf(scale, scale === 1 ? nominal : await run(vary(scenario, scale), dirs.scratchDir));
  const options = (range: readonly [number, number], direction: SearchOptions['direction']): SearchOptions => ({
    direction,
    nominal: 1,
    lower: range[0],
    upper: range[1],
    tolerance: settings.tolerance,
    checks: settings.checks,
  });

  if (settings.quantities.includes('friction')) {
    const started = performance.now();
    const search = await searchBoundary(probeWith(scaleFriction), options(settings.frictionRange, 'passAbove'));
    const lowest = lowestStaticFriction(scenario.plant.ground.friction);
    const friction: FrictionMarginRecord = {
      ...record(search, (performance.now() - started) / 1000),
      lowestStaticFriction: lowest,
      criticalStaticFriction: search.critical === null ? null : search.critical * lowest,
    };
    margin.friction = friction;
  } else notes.push('friction search not asked for');

  if (!settings.quantities.includes('push')) notes.push('push search not asked for');
  else if (scenario.plant.pushes.length === 0) notes.push('no push search: the scenario has no pushes');
  else {
    const started = performance.now();
    const search = await searchBoundary(probeWith(scalePushes), options(settings.pushRange, 'passBelow'));
    const peak = peakPushForce_N(scenario);
    const push: PushMarginRecord = {
      ...record(search, (performance.now() - started) / 1000),
      peakForce_N: peak,
      criticalPeakForce_N: search.critical === null ? null : search.critical * peak,
    };
    margin.push = push;
  }
  return { ...nominal, margin };
}

function checkRange(name: string, range: readonly [number, number]): string | null {
  const [lo, hi] = range;
  if (!(Number.isFinite(lo) && Number.isFinite(hi) && lo >= 0 && lo <= 1 && hi >= 1 && lo < hi)) {
    return `${name} [${lo}, ${hi}] must hold 1 (the scenario as written): expected 0 ≤ low ≤ 1 ≤ high, low < high`;
  }
  return null;
}

export async function runMargins(options: MarginRunOptions): Promise<MarginRunOutcome> {
  const lines: string[] = [];
  const log = (line: string) => {
    lines.push(line);
    options.log?.(line);
  };
  const badInput = (message: string): MarginRunOutcome => {
    log(message);
    return { exitCode: EXIT.badInput, lines };
  };
  const cwd = options.cwd ?? process.cwd();
  const settings = {
    tolerance: options.tolerance ?? MARGIN_DEFAULTS.tolerance,
    frictionRange: options.frictionRange ?? MARGIN_DEFAULTS.frictionRange,
    pushRange: options.pushRange ?? MARGIN_DEFAULTS.pushRange,
    checks: options.checks ?? MARGIN_DEFAULTS.checks,
    quantities: options.quantities ?? (['friction', 'push'] as const),
  };
  if (!(Number.isFinite(settings.tolerance) && settings.tolerance > 0 && settings.tolerance < 1)) {
    return badInput(`footing margin: --tolerance ${settings.tolerance} must be a number above 0 and below 1 (a fraction of the scenario's own friction or push)`);
  }
  if (!Number.isInteger(settings.checks) || settings.checks < 0 || settings.checks > 20) {
    return badInput(`footing margin: checks ${settings.checks} must be a whole number from 0 to 20`);
  }
  for (const [name, range] of [['friction range', settings.frictionRange], ['push range', settings.pushRange]] as const) {
    const problem = checkRange(name, range);
    if (problem) return badInput(`footing margin: ${problem}`);
  }

  const parsed = prepareBuilds('margin', options.builds, cwd);
  if (!parsed.ok) return badInput(parsed.lines.join('\n'));
  const specs = parsed.value;

  // The order footing run uses: scenarios by file then id (run/prepare.ts), builds as given.
  const loaded = await prepareScenarios('margin', options.paths, cwd);
  if (!loaded.ok) {
    for (const line of loaded.lines) log(line);
    return { exitCode: EXIT.badInput, lines };
  }
  for (const line of loaded.warnings) log(line);
  const scenarios = loaded.value;

  const outDir = path.resolve(cwd, options.outDir);
  mkdirSync(outDir, { recursive: true });
  // Probe runs write their report series too; those belong to no result and go to a scratch folder.
  const scratchDir = mkdtempSync(path.join(tmpdir(), 'footing-margin-'));
  const manifests: BuildManifest[] = await Promise.all(
    specs.map(async (spec) => {
      const manifest = await buildManifest(spec);
      return { ...manifest, commit: manifest.git?.commit ?? null, dirty: manifest.git?.dirty ?? null };
    }),
  );
  const startedAt = new Date();
  const wallStart = performance.now();
  const pairCount = scenarios.length * specs.length;
  const jobs = Math.max(1, Math.min(options.jobs ?? defaultJobs(), pairCount));
  const timeout = options.runTimeout ?? { base_s: 120, perSimulatedSecond: 30 };
  const pool = createRunPool(jobs);
  const runner = (spec: BuildSpec): Runner => (scenario, dir) => runOnPool(pool, scenario, spec, dir, timeout.base_s + timeout.perSimulatedSecond * scenario.duration_s);
  let ordered: RunResult[];
  try {
    ordered = await Promise.all(
      scenarios.flatMap((scenario) =>
        specs.map(async (spec) => {
          const result = await searchPair(scenario, runner(spec), { outDir, scratchDir }, settings);
          log(renderMarginLines([result])[0]);
          return result;
        }),
      ),
    );
  } finally {
    await pool.close();
    rmSync(scratchDir, { recursive: true, force: true });
  }
  const wall_s = (performance.now() - wallStart) / 1000;

  const results = createResultsFile({ toolVersion: TOOL_VERSION, builds: manifests, startedAt, runs: ordered });
  writeOutputs(outDir, results);
  writeFileAtomicSync(path.join(outDir, MARGIN_REPORT_NAME), renderMarginMarkdown(results, { wall_s, jobs }));
  const probes = ordered.reduce((n, r) => n + (r.margin?.friction?.runs ?? 0) + (r.margin?.push?.runs ?? 0) - (r.margin?.friction && r.margin?.push ? 1 : 0), 0);
  log(`${ordered.length} pairs, ${probes} runs in ${wall_s.toFixed(1)} s on ${jobs} worker${jobs === 1 ? '' : 's'} — ${path.relative(cwd, path.join(outDir, MARGIN_REPORT_NAME)) || MARGIN_REPORT_NAME}, ${OUTPUT_FILES.results}`);
  const allPass = ordered.every((r) => r.status === 'pass');
  return { exitCode: allPass ? EXIT.pass : EXIT.fail, results, lines };
}

async function runOnPool(pool: RunPool, scenario: ResolvedScenario, build: BuildSpec, outDir: string, timeout_s: number): Promise<RunResult> {
  try {
    return await pool.run({ scenario, build, outDir, trace: false }, timeout_s);
  } catch (error) {
    const reason = error instanceof RunTimeoutError ? 'run-timeout' : 'worker';
    return createErrorRunResult(scenario, build.name, { message: (error as Error).message, reason });
  }
}

