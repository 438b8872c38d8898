// The gate's rules applied to one pair of runs (same scenario and hash). Each returns a row when
// its metric moved or its rule is broken; informational metrics return a row when they moved.

import { fallSentence } from '../score/acceptance.js';
import type { ScoreMetrics } from '../score/types.js';
import type { GateRules } from './defaults.js';
import type { RunPair } from './pairing.js';
import type { GateRow, GateValue } from './types.js';

/**
 * Comparisons against an allowance forgive this much (common practice: a floating-point slack,
 * so 0.50 → 0.48 is a loss of exactly the 0.02 allowed, not 0.020000000000000018).
 */
const ALLOWANCE_SLACK = 1e-9;

const MINUS = '−';

function signed(delta: number, decimals: number, unit = ''): string {
  const text = Math.abs(delta).toFixed(decimals);
  if (Number(text) === 0) return `±${text}${unit}`;
  return `${delta < 0 ? MINUS : '+'}${text}${unit}`;
}

function relative(base: number, cand: number): string {
  if (base === 0) return cand === 0 ? '' : ' (new)';
  const percent = ((cand - base) / base) * 100;
  return ` (${percent < 0 ? MINUS : '+'}${Math.abs(percent).toFixed(0)} %)`;
}

function fmt(value: number | null, decimals: number): string {
  return value === null ? 'n/a' : value.toFixed(decimals);
}

type RowBase = Pick<GateRow, 'scenario' | 'baselineBuild' | 'candidateBuild'>;

function row(base: RowBase, fields: Omit<GateRow, keyof RowBase>): GateRow {
  return { ...base, ...fields };
}

function marginRule(
  at: RowBase,
  metric: string,
  label: string,
  base: number | null,
  cand: number | null,
  allowedLoss: number,
): GateRow | null {
  const rule = `loss ≤ ${allowedLoss}`;
  if (base === null && cand === null) return null;
  if (base !== null && cand === null) {
    return row(at, {
      metric, baseline: base, candidate: null, change: 'not measured', rule, broken: true,
      reason: `${label} not measured in the candidate (no foot was loaded)`,
    });
  }
  if (base === null || cand === null) {
    return row(at, { metric, baseline: base, candidate: cand, change: 'newly measured', rule: null, broken: false });
  }
  if (base === cand) return null;
  const loss = base - cand;
  const broken = loss > allowedLoss + ALLOWANCE_SLACK;
  return row(at, {
    metric, baseline: base, candidate: cand, change: signed(cand - base, 3), rule, broken,
    ...(broken ? { reason: `${label} fell by ${loss.toFixed(3)} (${fmt(base, 3)} → ${fmt(cand, 3)}), more than the ${allowedLoss} allowed` } : {}),
  });
}

function slipRule(at: RowBase, base: number, cand: number, rules: GateRules): GateRow | null {
  if (base === cand) return null;
  const growth_m = cand - base;
  const overAbsolute = growth_m > rules.slipDistanceGrowth_m + ALLOWANCE_SLACK;
  const overRelative = cand > base * (1 + rules.slipDistanceGrowthFraction) + ALLOWANCE_SLACK;
  const broken = overAbsolute && overRelative;
  const percent = Math.round(rules.slipDistanceGrowthFraction * 100);
  return row(at, {
    metric: 'slipDistance_m', baseline: base, candidate: cand,
    change: signed(growth_m, 4, ' m') + relative(base, cand),
    rule: `growth ≤ +${percent} % or ≤ +${rules.slipDistanceGrowth_m} m`, broken,
    ...(broken ? {
      reason: `slip distance grew from ${base.toFixed(4)} m to ${cand.toFixed(4)} m, more than both +${percent} % and +${rules.slipDistanceGrowth_m} m`,
    } : {}),
  });
}

function fallRule(at: RowBase, base: ScoreMetrics, cand: ScoreMetrics, rules: GateRules): GateRow | null {
  if (base.fell === cand.fell && base.fellAt_s === cand.fellAt_s) return null;
  const describe = (m: ScoreMetrics) => (m.fell ? `at ${fmt(m.fellAt_s, 2)} s` : 'no');
  const broken = !rules.allowNewFalls && cand.fell && !base.fell;
  return row(at, {
    metric: 'fell', baseline: base.fell ? base.fellAt_s : false, candidate: cand.fell ? cand.fellAt_s : false,
    change: `${describe(base)} → ${describe(cand)}`,
    rule: rules.allowNewFalls ? null : 'no new falls', broken,
    ...(broken ? { reason: `candidate ${fallSentence(cand)}; the baseline did not fall` } : {}),
  });
}

function commandedRule(at: RowBase, base: number, cand: number, rules: GateRules): GateRow | null {
  if (base === cand) return null;
  const broken = !rules.allowNewCommandedViolations && cand > base;
  return row(at, {
    metric: 'violations.commanded', baseline: base, candidate: cand, change: `${base} → ${cand}`,
    rule: rules.allowNewCommandedViolations ? null : 'no new commanded violations', broken,
    ...(broken ? { reason: `commanded friction-cone violations rose from ${base} to ${cand}` } : {}),
  });
}

function loopRule(at: RowBase, base: ScoreMetrics, cand: ScoreMetrics, rules: GateRules): GateRow | null {
  const b = base.loopTime_us.p99;
  const c = cand.loopTime_us.p99;
  if (c === null || b === c) return null;
  const budget_us = cand.loopTime_us.budget;
  const percent = Math.round(rules.loopTimeP99GrowthFraction * 100);
  const overGrowth = b !== null && c > b * (1 + rules.loopTimeP99GrowthFraction) + ALLOWANCE_SLACK;
  const overBudget = !rules.allowLoopTimeOverBudget && c > budget_us;
  const reasons: string[] = [];
  if (overGrowth) reasons.push(`loop time p99 grew from ${fmt(b, 1)} µs to ${c.toFixed(1)} µs, more than +${percent} %`);
  if (overBudget) reasons.push(`loop time p99 ${c.toFixed(1)} µs is over the ${budget_us} µs budget`);
  const rule = `growth ≤ +${percent} %` + (rules.allowLoopTimeOverBudget ? '' : `, ≤ budget ${budget_us} µs`);
  return row(at, {
    metric: 'loopTime_us.p99', baseline: b, candidate: c,
    change: b === null ? 'newly timed' : signed(c - b, 1, ' µs') + relative(b, c),
    rule, broken: reasons.length > 0,
    ...(reasons.length > 0 ? { reason: reasons.join('; ') } : {}),
  });
}

function info(at: RowBase, metric: string, base: number | null, cand: number | null, decimals: number, unit = ''): GateRow | null {
  if (base === cand) return null;
  const change = base === null || cand === null ? `${fmt(base, decimals)} → ${fmt(cand, decimals)}` : signed(cand - base, decimals, unit);
  return row(at, { metric, baseline: base, candidate: cand, change, rule: null, broken: false });
}

/** Rows for one pair, in a fixed metric order. The baseline run is never an error run here. */
export function compareRuns(pair: RunPair, rules: GateRules): GateRow[] {
  const { baseline, candidate } = pair;
  const at: RowBase = { scenario: baseline.scenario.id, baselineBuild: baseline.build, candidateBuild: candidate.build };
  const rows: GateRow[] = [];
  const status = (value: GateValue) => String(value);
  if (candidate.status === 'error' || candidate.metrics === null || baseline.metrics === null) {
    rows.push(row(at, {
      metric: 'status', baseline: baseline.status, candidate: candidate.status,
      change: `${status(baseline.status)} → ${status(candidate.status)}`, rule: 'candidate must not error', broken: true,
      reason: `candidate run errored: ${candidate.error?.message ?? candidate.reasons.join('; ')}`,
    }));
    return rows;
  }
  const b = baseline.metrics;
  const c = candidate.metrics;
  const candidates = [
    marginRule(at, 'frictionMargin.min', 'friction margin min', b.frictionMargin.min, c.frictionMargin.min, rules.frictionMarginMinLoss),
    marginRule(at, 'frictionMargin.p05', 'friction margin p05', b.frictionMargin.p05, c.frictionMargin.p05, rules.frictionMarginP05Loss),
    slipRule(at, b.slipDistance_m, c.slipDistance_m, rules),
    fallRule(at, b, c, rules),
    commandedRule(at, b.violations.commanded, c.violations.commanded, rules),
    loopRule(at, b, c, rules),
    info(at, 'violations.slip', b.violations.slip, c.violations.slip, 0),
    info(at, 'trackingRms_m', b.trackingRms_m, c.trackingRms_m, 4, ' m'),
    info(at, 'progress', b.progress, c.progress, 3),
    baseline.status === candidate.status
      ? null
      : row(at, { metric: 'status', baseline: baseline.status, candidate: candidate.status, change: `${baseline.status} → ${candidate.status}`, rule: null, broken: false }),
  ];
  for (const r of candidates) if (r !== null) rows.push(r);
  return rows;
}
