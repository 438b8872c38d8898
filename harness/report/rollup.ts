// The roll-up under the verdict: one row per compared build, read from the gate's own rows
// (GateRow.runChange on status rows, broken / preExisting on rule rows) — never a second gate —
// plus the worst friction-margin loss and slip growth against the baseline with the scenario
// holding each. And the gate's broken rows grouped by scenario, the worst change in each header.

import { formatGateValue } from '../gate/render.js';
import type { GateOutcome, GateRow } from '../gate/types.js';
import type { RunResult } from '../results/types.js';
import { label } from './plot/svg.js';

export interface RollUpWorst {
  change: string;
  scenario: string;
  title: string;
  anchor: string;
}

export interface RollUpRow {
  build: string;
  baseline: string;
  newFailures: number;
  stillFailing: number;
  fixed: number;
  passing: number;
  rulesNew: number;
  rulesPreExisting: number;
  blocking: number;
  /** Most negative change of friction margin min (null: no scenario lost margin). */
  worstMarginLoss: RollUpWorst | null;
  /** Largest growth of slip distance (null: no scenario slipped more). */
  worstSlipGrowth: RollUpWorst | null;
}

type AnchorOf = (run: RunResult) => string;

/** One row per candidate build of the gate's build pairs, in pair order. */
export function rollUp(gate: GateOutcome, runs: readonly RunResult[], anchorOf: AnchorOf): RollUpRow[] {
  return gate.buildPairs
    .filter(([base, cand]) => base !== cand)
    .map(([base, cand]) => {
      const rows = gate.rows.filter((r) => r.baselineBuild === base && r.candidateBuild === cand);
      const pairs = pairedRuns(runs, base, cand);
      const changes = { 'new-failure': 0, 'still-failing': 0, fixed: 0, passing: 0 };
      for (const r of rows) if (r.metric === 'status' && r.runChange) changes[r.runChange]++;
      const counted = changes['new-failure'] + changes['still-failing'] + changes.fixed;
      const broken = rows.filter((r) => r.broken);
      return {
        build: cand,
        baseline: base,
        newFailures: changes['new-failure'],
        stillFailing: changes['still-failing'],
        fixed: changes.fixed,
        passing: Math.max(0, pairs.length - counted),
        rulesNew: broken.filter((r) => !r.preExisting).length,
        rulesPreExisting: broken.filter((r) => r.preExisting).length,
        blocking: broken.filter((r) => r.blocking).length,
        worstMarginLoss: worst(pairs, (b, c) => (c.frictionMargin.min ?? NaN) - (b.frictionMargin.min ?? NaN), 'lowest', (d) => signed(d, 3), anchorOf),
        worstSlipGrowth: worst(pairs, (b, c) => c.slipDistance_m - b.slipDistance_m, 'highest', (d) => (Math.abs(d) < 0.1 ? `${signed(d * 1000, 1)} mm` : `${signed(d, 2)} m`), anchorOf),
      };
    });
}

function pairedRuns(runs: readonly RunResult[], base: string, cand: string): [RunResult, RunResult][] {
  const baseline = new Map(runs.filter((r) => r.build === base).map((r) => [`${r.scenario.id}\u0000${r.scenario.hash}`, r]));
  const out: [RunResult, RunResult][] = [];
  for (const c of runs) {
    if (c.build !== cand) continue;
    const b = baseline.get(`${c.scenario.id}\u0000${c.scenario.hash}`);
    if (b) out.push([b, c]);
  }
  return out;
}

type Metrics = NonNullable<RunResult['metrics']>;

function worst(pairs: [RunResult, RunResult][], change: (b: Metrics, c: Metrics) => number, side: 'lowest' | 'highest', text: (d: number) => string, anchorOf: AnchorOf): RollUpWorst | null {
  let best: { d: number; run: RunResult } | null = null;
  for (const [b, c] of pairs) {
    if (!b.metrics || !c.metrics) continue;
    const d = change(b.metrics, c.metrics);
    if (!Number.isFinite(d)) continue;
    if (side === 'lowest' ? d < 0 && (!best || d < best.d) : d > 0 && (!best || d > best.d)) best = { d, run: c };
  }
  return best ? { change: text(best.d), scenario: best.run.scenario.id, title: best.run.scenario.title, anchor: anchorOf(best.run) } : null;
}

function signed(value: number, digits: number): string {
  const text = label(Math.abs(value), digits);
  return `${value >= 0 ? '+' : '−'}${text}`;
}

export interface RegressionRowView {
  builds: string;
  metric: string;
  baseline: string;
  candidate: string;
  change: string;
  rule: string;
  reason: string;
  blocking: boolean;
  preExisting: boolean;
}

export interface RegressionGroup {
  scenario: string;
  title: string;
  anchor: string;
  rows: RegressionRowView[];
  blocking: number;
  /** The header's one-line summary of the scenario's worst change. */
  worst: string;
}

/**
 * The gate's broken rows by scenario, in the gate's order. The worst change of a scenario is its
 * first blocking row of the most severe kind: a new failure (status), a fall, then the rest in the
 * gate's metric order.
 */
export function regressionGroups(gate: GateOutcome | null, titles: Map<string, string>, anchors: Map<string, string>): RegressionGroup[] {
  const groups = new Map<string, GateRow[]>();
  for (const r of gate?.rows ?? []) {
    if (!r.broken) continue;
    if (!groups.has(r.scenario)) groups.set(r.scenario, []);
    (groups.get(r.scenario) as GateRow[]).push(r);
  }
  const severity = (r: GateRow) => (r.blocking ? 0 : 10) + (r.metric === 'status' ? 0 : r.metric === 'fell' ? 1 : 2);
  return [...groups.entries()].map(([scenario, rows]) => {
    const top = [...rows].sort((a, b) => severity(a) - severity(b))[0];
    return {
      scenario,
      title: titles.get(scenario) ?? '',
      anchor: anchors.get(scenario) ?? '',
      blocking: rows.filter((r) => r.blocking).length,
      worst: `${pairText(top)} ${top.metric} ${top.change}${top.preExisting ? ' (pre-existing)' : ''}`,
      rows: rows.map((r) => ({
        builds: pairText(r),
        metric: r.metric,
        baseline: formatGateValue(r.metric, r.baseline),
        candidate: formatGateValue(r.metric, r.candidate),
        change: r.change,
        rule: r.rule ?? '(info)',
        reason: r.reason ?? '',
        blocking: r.blocking === true,
        preExisting: r.preExisting === true,
      })),
    };
  });
}

const pairText = (r: GateRow) => (r.baselineBuild === r.candidateBuild ? r.baselineBuild : `${r.baselineBuild} → ${r.candidateBuild}`);
