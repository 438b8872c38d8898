// The gate's rules applied to one pair of runs (same scenario and hash). Each returns a row when
// its metric moved or its rule is broken; informational metrics return a row when they moved.

import { fallSentence } from '../score/acceptance.js';
import { formatFixed } from '../score/format.js';
import { firstReason } from '../results/runResult.js';
import type { RunResult } from '../results/types.js';
import type { ScoreMetrics } from '../score/types.js';
import type { GateRules } from './defaults.js';
import type { RunPair } from './pairing.js';
import { classifyRunChange } from './runChange.js';
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
  return value === null ? 'n/a' : formatFixed(value, decimals);
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
  allowedLoss: number | null,
): GateRow | null {
  // A rule set to null is off: the change is still shown, for information.
  const rule = allowedLoss === null ? null : `loss ≤ ${allowedLoss}`;
  if (base === null && cand === null) return null;
  if (base !== null && cand === null) {
    return row(at, {
      metric, baseline: base, candidate: null, change: 'not measured', rule, broken: rule !== null,
      reason: `${label} not measured in the candidate (no foot was loaded)`,
    });
  }
  if (base === null || cand === null) {
    return row(at, { metric, baseline: base, candidate: cand, change: 'newly measured', rule: null, broken: false });
  }
  if (base === cand) return null;
  const loss = base - cand;
  const broken = allowedLoss !== null && loss > allowedLoss + ALLOWANCE_SLACK;
  return row(at, {
    metric, baseline: base, candidate: cand, change: signed(cand - base, 3), rule, broken,
    ...(broken ? { reason: `${label} fell by ${loss.toFixed(3)} (${fmt(base, 3)} → ${fmt(cand, 3)}), more than the ${allowedLoss} allowed` } : {}),
  });
}

interface GrowthRule {
  metric: string;
  label: string;
  fraction: number | null;
  absolute_m: number | null;
  /** Decimals of the metres printed. */
  decimals: number;
}

/** Growth beyond every allowance that is on (fraction of the baseline and metres); both off: off. */
function growthRule(at: RowBase, rule: GrowthRule, base: number, cand: number): GateRow | null {
  if (base === cand) return null;
  const growth_m = cand - base;
  const { fraction, absolute_m } = rule;
  const overAbsolute = absolute_m === null || growth_m > absolute_m + ALLOWANCE_SLACK;
  const overRelative = fraction === null || cand > base * (1 + fraction) + ALLOWANCE_SLACK;
  const on = fraction !== null || absolute_m !== null;
  const broken = on && overAbsolute && overRelative;
  const limits = [
    ...(fraction === null ? [] : [`+${Math.round(fraction * 100)} %`]),
    ...(absolute_m === null ? [] : [`+${absolute_m} m`]),
  ];
  return row(at, {
    metric: rule.metric, baseline: base, candidate: cand,
    change: signed(growth_m, rule.decimals, ' m') + relative(base, cand),
    rule: on ? `growth ≤ ${limits.join(' or ≤ ')}` : null, broken,
    ...(broken ? {
      reason: `${rule.label} grew from ${base.toFixed(rule.decimals)} m to ${cand.toFixed(rule.decimals)} m, more than ${limits.length > 1 ? 'both ' : ''}${limits.join(' and ')}`,
    } : {}),
  });
}

function slipRule(at: RowBase, base: number, cand: number, rules: GateRules): GateRow | null {
  return growthRule(at, { metric: 'slipDistance_m', label: 'slip distance', fraction: rules.slipDistanceGrowthFraction, absolute_m: rules.slipDistanceGrowth_m, decimals: 4 }, base, cand);
}

/** Mean slip per touchdown; compared only when both sides measured touchdowns. */
function touchdownSlipRule(at: RowBase, base: ScoreMetrics, cand: ScoreMetrics, rules: GateRules): GateRow | null {
  const b = base.touchdown?.slip_m.mean ?? null;
  const c = cand.touchdown?.slip_m.mean ?? null;
  if (b === null || c === null) return b === c ? null : info(at, 'touchdown.slip_m.mean', b, c, 6, ' m');
  return growthRule(at, {
    metric: 'touchdown.slip_m.mean', label: 'slip per touchdown',
    fraction: rules.touchdownSlipGrowthFraction, absolute_m: rules.touchdownSlipGrowth_m, decimals: 6,
  }, b, c);
}

function fallRule(at: RowBase, base: ScoreMetrics, cand: ScoreMetrics, rules: GateRules): GateRow | null {
  if (base.fell === cand.fell && base.fellAt_s === cand.fellAt_s) return null;
  const describe = (m: ScoreMetrics) => (m.fell ? `at ${fmt(m.fellAt_s, 2)} s` : 'no');
  const on = rules.allowNewFalls === false;
  const broken = on && cand.fell && !base.fell;
  return row(at, {
    metric: 'fell', baseline: base.fell ? base.fellAt_s : false, candidate: cand.fell ? cand.fellAt_s : false,
    change: `${describe(base)} → ${describe(cand)}`,
    rule: on ? 'no new falls' : null, broken,
    ...(broken ? { reason: `candidate ${fallSentence(cand)}; the baseline did not fall` } : {}),
  });
}

function commandedRule(at: RowBase, base: number, cand: number, rules: GateRules): GateRow | null {
  if (base === cand) return null;
  const on = rules.allowNewCommandedViolations === false;
  const broken = on && cand > base;
  return row(at, {
    metric: 'violations.commanded', baseline: base, candidate: cand, change: `${base} → ${cand}`,
    rule: on ? 'no new commanded violations' : null, broken,
    ...(broken ? { reason: `commanded friction-cone violations rose from ${base} to ${cand}` } : {}),
  });
}

/**
 * A single pass's loop-time p99, for information unless the policy sets a growth fraction: one
 * run's p99 moves with whatever else the machine did meanwhile. The paired measurement
 * (loopTimeRules.ts) is what judges loop time by default.
 */
function loopRule(at: RowBase, base: ScoreMetrics, cand: ScoreMetrics, rules: GateRules): GateRow | null {
  const b = base.loopTime_us.p99;
  const c = cand.loopTime_us.p99;
  if (c === null || b === c) return null;
  const fraction = rules.loopTimeP99GrowthFraction;
  const change = b === null ? 'newly timed' : signed(c - b, 1, ' µs') + relative(b, c);
  if (fraction === null) return row(at, { metric: 'loopTime_us.p99', baseline: b, candidate: c, change, rule: null, broken: false });
  const percent = Math.round(fraction * 100);
  const broken = b !== null && c > b * (1 + fraction) + ALLOWANCE_SLACK;
  return row(at, {
    metric: 'loopTime_us.p99', baseline: b, candidate: c, change, rule: `single-pass growth ≤ +${percent} %`, broken,
    ...(broken ? { reason: `loop time p99 of one pass grew from ${fmt(b, 1)} µs to ${c.toFixed(1)} µs, more than +${percent} %` } : {}),
  });
}

/**
 * The run's own verdict compared across sides: a new failure blocks (unless allowed), a failure
 * inherited from the baseline is listed as still failing and blocks only by policy, a fix is shown.
 */
function statusRule(at: RowBase, base: RunResult, cand: RunResult, rules: GateRules): GateRow | null {
  const change = classifyRunChange(base.status, cand.status);
  const shift = `${base.status} → ${cand.status}`;
  switch (change) {
    case 'passing':
      return null;
    case 'fixed':
      return row(at, { metric: 'status', baseline: base.status, candidate: cand.status, change: shift, rule: null, broken: false, runChange: change });
    case 'new-failure': {
      const on = rules.allowNewFailures === false;
      return row(at, {
        metric: 'status', baseline: base.status, candidate: cand.status, change: shift, rule: on ? 'no new failures' : null, broken: on, runChange: change,
        ...(on ? { reason: `new failure: ${firstReason(cand)} (the baseline passed)` } : {}),
      });
    }
    case 'still-failing':
      return row(at, {
        metric: 'status', baseline: base.status, candidate: cand.status, change: shift, rule: 'no failures', broken: true, preExisting: true, runChange: change,
        reason: `still failing: ${firstReason(cand)} (fails on the baseline too: ${firstReason(base)})`,
      });
  }
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
  const status = statusRule(at, baseline, candidate, rules);
  if (candidate.status === 'error' || candidate.metrics === null || baseline.metrics === null) {
    if (status !== null) rows.push(status);
    return rows;
  }
  const b = baseline.metrics;
  const c = candidate.metrics;
  const candidates = [
    status,
    // The margin rules judge the stance margin; a side scored before it existed has none (null).
    marginRule(at, 'stanceMargin.min', 'stance friction margin min', b.stanceMargin?.min ?? null, c.stanceMargin?.min ?? null, rules.frictionMarginMinLoss),
    marginRule(at, 'stanceMargin.p05', 'stance friction margin p05', b.stanceMargin?.p05 ?? null, c.stanceMargin?.p05 ?? null, rules.frictionMarginP05Loss),
    slipRule(at, b.slipDistance_m, c.slipDistance_m, rules),
    touchdownSlipRule(at, b, c, rules),
    fallRule(at, b, c, rules),
    commandedRule(at, b.violations.commanded, c.violations.commanded, rules),
    loopRule(at, b, c, rules),
    info(at, 'frictionMargin.min', b.frictionMargin.min, c.frictionMargin.min, 3),
    info(at, 'frictionMargin.p05', b.frictionMargin.p05, c.frictionMargin.p05, 3),
    info(at, 'violations.slip', b.violations.slip, c.violations.slip, 0),
    info(at, 'trackingRms_m', b.trackingRms_m, c.trackingRms_m, 4, ' m'),
    info(at, 'progress', b.progress, c.progress, 3),
  ];
  for (const r of candidates) if (r !== null) rows.push(r);
  return rows;
}
