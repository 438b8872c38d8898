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
export function gateLimit(metric: string, reference: number, rules: GateRules, extra: { loopBudget_us?: number } = {}): GateLimit | null {
  switch (metric) {
    case 'frictionMargin.min':
      return { value: reference - rules.frictionMarginMinLoss, breaks: 'below', rule: `loss ≤ ${rules.frictionMarginMinLoss}` };
    case 'frictionMargin.p05':
      return { value: reference - rules.frictionMarginP05Loss, breaks: 'below', rule: `loss ≤ ${rules.frictionMarginP05Loss}` };
    case 'slipDistance_m':
      // A breach must exceed both allowances, so the line is the larger of the two.
      return {
        value: Math.max(reference + rules.slipDistanceGrowth_m, reference * (1 + rules.slipDistanceGrowthFraction)),
        breaks: 'above',
        rule: `growth ≤ +${Math.round(rules.slipDistanceGrowthFraction * 100)} % or ≤ +${rules.slipDistanceGrowth_m} m`,
      };
    case 'violations.commanded':
      return rules.allowNewCommandedViolations ? null : { value: reference, breaks: 'above', rule: 'no new commanded violations' };
    case 'fell':
      return rules.allowNewFalls || reference !== 0 ? null : { value: 0, breaks: 'above', rule: 'no new falls' };
    case 'loopTime_us.p99': {
      const growth = reference * (1 + rules.loopTimeP99GrowthFraction);
      const budget = !rules.allowLoopTimeOverBudget && extra.loopBudget_us !== undefined ? extra.loopBudget_us : Infinity;
      return { value: Math.min(growth, budget), breaks: 'above', rule: `growth ≤ +${Math.round(rules.loopTimeP99GrowthFraction * 100)} %${budget < Infinity ? `, ≤ budget ${budget} µs` : ''}` };
    }
    default:
      return null;
  }
}
