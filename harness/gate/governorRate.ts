// Gate rule on bench figures (#7): a candidate's governor update rate must not drop by more than
// the policy's `governorRateDrop` (a fraction, default 0.30 in defaults.ts) from the baseline
// build's. The figures come from the optional `bench` field of results.json (`footing run
// --bench`); a pair where either side was not measured yields no row (nothing to judge).
// Rates are compared within one machine only: a drop between machines is not a regression.

import type { ResultsFile } from '../results/types.js';
import type { GateRules } from './defaults.js';
import type { GateRow } from './types.js';

/** Comparisons against an allowance forgive this much (floating-point slack, as in rules.ts). */
const ALLOWANCE_SLACK = 1e-9;

/** The governor update rate of `build` in attached bench figures, or null when not measured. */
export function governorRateOf(results: Pick<ResultsFile, 'bench'>, build: string): number | null {
  const builds = results.bench?.builds;
  if (!Array.isArray(builds)) return null;
  for (const entry of builds) {
    const record = entry as { name?: unknown; governor?: { updatesPerSecond?: unknown } } | null;
    if (record === null || typeof record !== 'object' || record.name !== build) continue;
    const rate = record.governor?.updatesPerSecond;
    return typeof rate === 'number' && Number.isFinite(rate) && rate > 0 ? rate : null;
  }
  return null;
}

function benchScenario(results: Pick<ResultsFile, 'bench'>): string {
  const scenario = results.bench?.scenario as { id?: unknown } | undefined;
  return typeof scenario?.id === 'string' ? `bench:${scenario.id}` : 'bench';
}

function machineOf(results: Pick<ResultsFile, 'bench'>): string | null {
  const machine = results.bench?.machine as { cpuModel?: unknown; cores?: unknown } | undefined;
  return machine ? `${String(machine.cpuModel)} × ${String(machine.cores)}` : null;
}

/**
 * One row per build pair whose governor rate was measured on both sides; broken when the
 * candidate's rate is below (1 − governorRateDrop) × the baseline's.
 */
export function governorRateRows(
  baseline: Pick<ResultsFile, 'bench'>,
  candidate: Pick<ResultsFile, 'bench'>,
  buildPairs: [string, string][],
  rules: Pick<GateRules, 'governorRateDrop'>,
): GateRow[] {
  const rows: GateRow[] = [];
  const drop = rules.governorRateDrop;
  if (drop === null) return rows;
  const percent = Math.round(drop * 100);
  const baseMachine = machineOf(baseline), candMachine = machineOf(candidate);
  for (const [baseBuild, candBuild] of buildPairs) {
    const base = governorRateOf(baseline, baseBuild);
    const cand = governorRateOf(candidate, candBuild);
    if (base === null || cand === null) continue;
    const change = (cand - base) / base;
    const broken = cand < base * (1 - drop) - ALLOWANCE_SLACK;
    const sameMachine = baseMachine === candMachine;
    rows.push({
      scenario: benchScenario(candidate),
      baselineBuild: baseBuild,
      candidateBuild: candBuild,
      metric: 'bench.governor.updatesPerSecond',
      baseline: Math.round(base),
      candidate: Math.round(cand),
      change: `${change < 0 ? '−' : '+'}${Math.abs(change * 100).toFixed(0)} %`,
      rule: `drop ≤ ${percent} %`,
      broken,
      ...(broken
        ? {
            reason:
              `governor update rate fell from ${Math.round(base)} to ${Math.round(cand)} per second ` +
              `(−${(-change * 100).toFixed(0)} %), more than the ${percent} % allowed` +
              (sameMachine ? '' : ` (note: measured on different machines, ${baseMachine} vs ${candMachine})`),
          }
        : {}),
    });
  }
  return rows;
}
