// Gate rules on margin searches (footing margin, docs/margin.md): the critical friction scale may
// not rise — the build needing more grip — by more than the policy allows, and the critical push
// scale may not drop by more than allowed. Both are judged on paired runs (same scenario and
// hash), so a build that loses margin is caught even when every run still passes as written.

import type { MarginSearchRecord } from '../results/margin.js';
import type { GateRules } from './defaults.js';
import type { RunPair } from './pairing.js';
import type { GateRow } from './types.js';

/** As rules.ts: a loss of exactly the allowance holds. */
const ALLOWANCE_SLACK = 1e-9;

type At = Pick<GateRow, 'scenario' | 'baselineBuild' | 'candidateBuild'>;

function shown(s: MarginSearchRecord): string {
  if (s.criticalScale === null) return 'none in range';
  const bound = s.outcome === 'passesWholeRange' ? (s.range[0] === s.criticalScale ? '≤ ' : '≥ ') : '';
  return `${bound}${s.criticalScale.toFixed(3)}${s.monotone ? '' : ' (not monotone)'}`;
}

function signed(delta: number): string {
  const text = Math.abs(delta).toFixed(3);
  return Number(text) === 0 ? `±${text}` : `${delta < 0 ? '−' : '+'}${text}`;
}

/**
 * `worse`: +1 when a higher critical scale is worse (friction: more grip needed), −1 when a lower
 * one is (push: a smaller shove topples it).
 */
function searchRule(
  at: At,
  metric: string,
  label: string,
  base: MarginSearchRecord | null | undefined,
  cand: MarginSearchRecord | null | undefined,
  allowed: number | null,
  worse: 1 | -1,
): GateRow | null {
  if (!base || !cand) return null;
  // A rule set to null is off: the change is still shown, for information.
  const rule = allowed === null ? null : `${worse > 0 ? 'rise' : 'drop'} ≤ ${allowed}`;
  const b = base.criticalScale;
  const c = cand.criticalScale;
  if (b === null && c === null) return null;
  if (c === null) {
    return {
      ...at, metric, baseline: b, candidate: null, change: 'lost', rule, broken: rule !== null,
      reason: `${label} was ${b!.toFixed(3)}, but the candidate ${worse > 0 ? 'fails even at the top of the searched range' : 'fails even without the push'} (${cand.range[0]}–${cand.range[1]})`,
    };
  }
  if (b === null) return { ...at, metric, baseline: null, candidate: c, change: 'newly found', rule: null, broken: false };
  const monotoneNote = base.monotone && cand.monotone ? '' : ' (a boundary is not monotone: see the samples in margin.md)';
  if (b === c && monotoneNote === '') return null;
  const loss = worse * (c - b);
  const broken = allowed !== null && loss > allowed + ALLOWANCE_SLACK;
  return {
    ...at, metric, baseline: b, candidate: c, change: signed(c - b) + monotoneNote, rule, broken,
    ...(broken ? { reason: `${label} ${worse > 0 ? 'rose' : 'fell'} by ${Math.abs(c - b).toFixed(3)} (${shown(base)} → ${shown(cand)}), more than the ${allowed} allowed` } : {}),
  };
}

/** Rows for the margin searches of one run pair (none when neither run carries margin data). */
export function compareMargins(pair: RunPair, rules: GateRules): GateRow[] {
  const base = pair.baseline.margin;
  const cand = pair.candidate.margin;
  if (!base || !cand) return [];
  const at: At = { scenario: pair.baseline.scenario.id, baselineBuild: pair.baseline.build, candidateBuild: pair.candidate.build };
  const rows = [
    searchRule(at, 'margin.criticalFrictionScale', 'critical friction scale', base.friction, cand.friction, rules.criticalFrictionScaleRise, 1),
    searchRule(at, 'margin.criticalPushScale', 'critical push scale', base.push, cand.push, rules.criticalPushScaleDrop, -1),
  ];
  return rows.filter((r): r is GateRow => r !== null);
}
