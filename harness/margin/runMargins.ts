// `footing margin`: for every (scenario × build) pair, the critical friction scale (smallest factor
// on every material's friction at which acceptance still holds) and the critical push scale
// (largest factor on every push's force it survives). Pairs run concurrently on the worker pool;
// each pair's probes run one after another, because each bisection step needs the last outcome.

import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { BuildSpec } from '../builds/spec.js';
import { createRunPool, defaultJobs, runOnPool, DEFAULT_RUN_TIMEOUT, type RunTimeout } from '../run/pool.js';
import type { RunResult } from '../results/types.js';
import type { ResolvedScenario } from '../scenario/types.js';
import { lowestStaticFriction, peakPushForce_N, scaleFriction, scalePushes } from '../scenario/variation.js';
import { renderMarginLines } from './render.js';
import type { SearchResult } from '../results/margin.js';
import { searchBoundary, type SearchOptions } from './search.js';
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

export type MarginQuantity = 'friction' | 'push';

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
  settings: MarginSettings,
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

export interface MarginSettings {
  tolerance: number;
  frictionRange: readonly [number, number];
  pushRange: readonly [number, number];
  checks: number;
  quantities: readonly MarginQuantity[];
}

/** The settings' problem as one sentence (bad input), or null when they are usable. */
export function checkMarginSettings(settings: MarginSettings): string | null {
  if (!(Number.isFinite(settings.tolerance) && settings.tolerance > 0 && settings.tolerance < 1)) {
    return `--tolerance ${settings.tolerance} must be a number above 0 and below 1 (a fraction of the scenario's own friction or push)`;
  }
  if (!Number.isInteger(settings.checks) || settings.checks < 0 || settings.checks > 20) {
    return `checks ${settings.checks} must be a whole number from 0 to 20`;
  }
  for (const [name, range] of [['friction range', settings.frictionRange], ['push range', settings.pushRange]] as const) {
    const problem = checkRange(name, range);
    if (problem) return problem;
  }
  return null;
}

function checkRange(name: string, range: readonly [number, number]): string | null {
  const [lo, hi] = range;
  if (!(Number.isFinite(lo) && Number.isFinite(hi) && lo >= 0 && lo <= 1 && hi >= 1 && lo < hi)) {
    return `${name} [${lo}, ${hi}] must hold 1 (the scenario as written): expected 0 ≤ low ≤ 1 ≤ high, low < high`;
  }
  return null;
}

export interface MarginSearchOptions {
  scenarios: readonly ResolvedScenario[];
  builds: readonly BuildSpec[];
  /** Absolute results folder (the nominal runs' series go here). */
  outDir: string;
  settings: MarginSettings;
  jobs?: number;
  runTimeout?: RunTimeout;
  log: (line: string) => void;
}

/** Both searches of every pair, pairs in parallel on the worker pool; runs in pair order. */
export async function searchMargins(options: MarginSearchOptions): Promise<{ runs: RunResult[]; wall_s: number; jobs: number }> {
  const { scenarios, builds, outDir, settings, log } = options;
  // Probe runs write their report series too; those belong to no result and go to a scratch folder.
  const scratchDir = mkdtempSync(path.join(tmpdir(), 'footing-margin-'));
  const wallStart = performance.now();
  const pairCount = scenarios.length * builds.length;
  const jobs = Math.max(1, Math.min(options.jobs ?? defaultJobs(), pairCount));
  const timeout = options.runTimeout ?? DEFAULT_RUN_TIMEOUT;
  const pool = createRunPool(jobs);
  const runner = (build: BuildSpec): Runner => (scenario, dir) => runOnPool(pool, { scenario, build, outDir: dir, trace: false }, timeout);
  let runs: RunResult[];
  try {
    runs = await Promise.all(
      scenarios.flatMap((scenario) =>
        builds.map(async (build) => {
          const result = await searchPair(scenario, runner(build), { outDir, scratchDir }, settings);
          log(renderMarginLines([result])[0]);
          return result;
        }),
      ),
    );
  } finally {
    await pool.close();
    rmSync(scratchDir, { recursive: true, force: true });
  }
  return { runs, wall_s: (performance.now() - wallStart) / 1000, jobs };
}
