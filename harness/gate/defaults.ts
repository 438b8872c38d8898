// The gate's policy: its rules and their defaults — the one place these numbers live
// (docs/scoring.md writes them out as a complete example policy; a test keeps the two equal).

export interface GateRules {
  /** Allowed drop of frictionMargin.min (absolute, margin units). */
  frictionMarginMinLoss: number;
  /** Allowed drop of frictionMargin.p05 (absolute). */
  frictionMarginP05Loss: number;
  /** Slip distance may grow by this fraction of the baseline … */
  slipDistanceGrowthFraction: number;
  /** … and by this many metres: a breach must exceed both allowances. */
  slipDistanceGrowth_m: number;
  /** A run that fell where the baseline stood. */
  allowNewFalls: boolean;
  /** More commanded friction-cone violation intervals than the baseline. */
  allowNewCommandedViolations: boolean;
  /** Allowed growth of the loop time p99 as a fraction of the baseline's. */
  loopTimeP99GrowthFraction: number;
  /** The candidate's loop time p99 above the scenario's loop budget. */
  allowLoopTimeOverBudget: boolean;
  /** Allowed drop of a governor update rate (bench data; validated, not applied to run results). */
  governorRateDrop: number;
  /** Allowed rise of margin.friction.criticalScale (footing margin): the build needing more grip. */
  criticalFrictionScaleRise: number;
  /** Allowed drop of margin.push.criticalScale (footing margin). */
  criticalPushScaleDrop: number;
  /** A family's success rate may drop by this much before a supported drop blocks (0: any). */
  familySuccessRateDrop: number;
  /** Confidence of the family drop test (Newcombe 1998 interval), e.g. 0.95. */
  familyConfidence: number;
}

export const GATE_RULE_NAMES = [
  'frictionMarginMinLoss',
  'frictionMarginP05Loss',
  'slipDistanceGrowthFraction',
  'slipDistanceGrowth_m',
  'allowNewFalls',
  'allowNewCommandedViolations',
  'loopTimeP99GrowthFraction',
  'allowLoopTimeOverBudget',
  'governorRateDrop',
  'criticalFrictionScaleRise',
  'criticalPushScaleDrop',
  'familySuccessRateDrop',
  'familyConfidence',
] as const satisfies readonly (keyof GateRules)[];

export const DEFAULT_GATE_RULES: Readonly<GateRules> = Object.freeze({
  // 0.02 of margin is about the run-to-run spread of p05 between builds that differ only in
  // numerics (common practice: tolerate noise, catch a lost safety factor).
  frictionMarginMinLoss: 0.02,
  frictionMarginP05Loss: 0.02,
  // +20 % alone would flag 1 mm → 1.3 mm of creep; +0.01 m alone would hide a doubling of a small
  // slip. Requiring both keeps the rule quiet on noise and loud on real sliding.
  slipDistanceGrowthFraction: 0.2,
  slipDistanceGrowth_m: 0.01,
  allowNewFalls: false,
  allowNewCommandedViolations: false,
  // Loop timings vary ±10–20 % between quiet runs on a shared CI machine (common practice).
  loopTimeP99GrowthFraction: 0.25,
  allowLoopTimeOverBudget: false,
  governorRateDrop: 0.3,
  // Three times the margin search's default tolerance (0.01): two searches that each land within a
  // tolerance of the same boundary never trip it, a build that needs 3 % more grip does.
  criticalFrictionScaleRise: 0.03,
  // Five tolerances of the push search: a push bracket spans a wider range (0–3) than friction's,
  // so it gets a little more slack (common practice, not a measured spread).
  criticalPushScaleDrop: 0.05,
  familySuccessRateDrop: 0,
  // The usual two-sided 95 % of reporting practice (common practice).
  familyConfidence: 0.95,
});

export interface GatePolicy {
  rules: GateRules;
  /** Per-scenario-id overrides of any rule. */
  overrides: Record<string, Partial<GateRules>>;
  /** Where the policy came from (for messages); undefined for the built-in defaults. */
  file?: string;
}

export function defaultPolicy(): GatePolicy {
  return { rules: { ...DEFAULT_GATE_RULES }, overrides: {} };
}

export function rulesFor(policy: GatePolicy, scenarioId: string): GateRules {
  const override = policy.overrides[scenarioId];
  return override ? { ...policy.rules, ...override } : policy.rules;
}
