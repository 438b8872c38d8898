// Where the gate would draw the line for a trend metric, against a reference night's value: the
// same allowances as harness/gate/rules.ts (test/history/limits.test.ts holds the two together by
// gating runs just inside and just outside each line).

import type { GateRules } from '../gate/defaults.js';

export interface GateLimit {
  /** Values beyond this break the gate rule against the reference night. */
  value: number;
  /** 'below': a lower value breaks it (margins); 'above': a higher one does. */
  breaks: 'below' | 'above';
  rule: string;
}

/** Null when the rule allows any value (or the metric has no gate rule). */
export function gateLimit(metric: string, reference: number, rules: GateRules, _extra: { loopBudget_us?: number } = {}): GateLimit | null {
  // A rule set to null in the policy is off: no line for it.
  switch (metric) {
    // The gate's margin rules judge the stance margin (touchdown transients apart).
    case 'stanceMargin.min': {
      const loss = rules.frictionMarginMinLoss;
      return loss === null ? null : { value: reference - loss, breaks: 'below', rule: `loss ≤ ${loss}` };
    }
    case 'stanceMargin.p05': {
      const loss = rules.frictionMarginP05Loss;
      return loss === null ? null : { value: reference - loss, breaks: 'below', rule: `loss ≤ ${loss}` };
    }
    case 'slipDistance_m': {
      const absolute_m = rules.slipDistanceGrowth_m;
      const fraction = rules.slipDistanceGrowthFraction;
      if (absolute_m === null && fraction === null) return null;
      // A breach must exceed every allowance that is on, so the line is the larger of them.
      const lines = [...(absolute_m === null ? [] : [reference + absolute_m]), ...(fraction === null ? [] : [reference * (1 + fraction)])];
      const parts = [...(fraction === null ? [] : [`+${Math.round(fraction * 100)} %`]), ...(absolute_m === null ? [] : [`+${absolute_m} m`])];
      return { value: Math.max(...lines), breaks: 'above', rule: `growth ≤ ${parts.join(' or ≤ ')}` };
    }
    case 'violations.commanded':
      return rules.allowNewCommandedViolations !== false ? null : { value: reference, breaks: 'above', rule: 'no new commanded violations' };
    case 'fell':
      return rules.allowNewFalls !== false || reference !== 0 ? null : { value: 0, breaks: 'above', rule: 'no new falls' };
    case 'loopTime_us.p99': {
      // Single-pass p99 is gated only when the policy sets a growth fraction (off by default).
      const fraction = rules.loopTimeP99GrowthFraction;
      if (fraction === null) return null;
      return { value: reference * (1 + fraction), breaks: 'above', rule: `single-pass growth ≤ +${Math.round(fraction * 100)} %` };
    }
    default:
      return null;
  }
}
