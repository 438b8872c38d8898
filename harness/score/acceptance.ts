// A scenario's acceptance checks against a run's metrics, with a human sentence for each broken
// check ("slip distance 0.31 m > 0.05 m", "fell at 3.42 s (trunk tilted beyond 60°)").

import type { Acceptance } from '../scenario/types.js';
import { formatFixed, formatPair, plural } from './format.js';
import { FALL_HEIGHT_FRACTION, FALL_TILT_deg } from './thresholds.js';
import type { FallReason, ScoreMetrics } from './types.js';

export interface AcceptanceOutcome {
  status: 'pass' | 'fail';
  reasons: string[];
}

export const FALL_REASON_TEXT: Record<FallReason, string> = {
  trunkContact: 'trunk touched the ground',
  trunkTilted: `trunk tilted beyond ${FALL_TILT_deg}°`,
  trunkLow: `trunk centre below ${FALL_HEIGHT_FRACTION * 100} % of standing height`,
};

export function fallSentence(metrics: Pick<ScoreMetrics, 'fellAt_s' | 'fallReason'>): string {
  const at = metrics.fellAt_s === null ? '' : ` at ${formatFixed(metrics.fellAt_s)} s`;
  const why = metrics.fallReason === null ? '' : ` (${FALL_REASON_TEXT[metrics.fallReason]})`;
  return `fell${at}${why}`;
}

export function evaluateAcceptance(acceptance: Acceptance, metrics: ScoreMetrics): AcceptanceOutcome {
  const reasons: string[] = [];

  if (acceptance.mustNotFall && metrics.fell) reasons.push(fallSentence(metrics));

  // Judged on the stance margin (touchdown transients excluded, docs/scoring.md); results scored
  // before the stance margin existed fall back to the whole-run margin.
  if (acceptance.minFrictionMargin !== null) {
    const margin = (metrics.stanceMargin ?? metrics.frictionMargin).min;
    if (margin === null) {
      reasons.push('stance friction margin not measured: no foot was ever loaded in stance');
    } else if (margin < acceptance.minFrictionMargin) {
      const [value, limit] = formatPair(margin, acceptance.minFrictionMargin);
      reasons.push(`stance friction margin ${value} < ${limit}`);
    }
  }

  if (acceptance.maxSlipDistance_m !== null && metrics.slipDistance_m > acceptance.maxSlipDistance_m) {
    const [value, limit] = formatPair(metrics.slipDistance_m, acceptance.maxSlipDistance_m);
    reasons.push(`slip distance ${value} m > ${limit} m`);
  }

  if (
    acceptance.maxCommandedViolations !== null &&
    metrics.violations.commanded > acceptance.maxCommandedViolations
  ) {
    reasons.push(
      `${plural(metrics.violations.commanded, 'commanded friction-cone violation')} > ` +
        `${acceptance.maxCommandedViolations} allowed`,
    );
  }

  if (acceptance.minProgress !== null) {
    if (metrics.progress === null) {
      reasons.push('progress not measured: the scenario commands no travel');
    } else if (metrics.progress < acceptance.minProgress) {
      const [value, limit] = formatPair(metrics.progress, acceptance.minProgress);
      reasons.push(`progress ${value} < ${limit} of the commanded travel`);
    }
  }

  return { status: reasons.length === 0 ? 'pass' : 'fail', reasons };
}
