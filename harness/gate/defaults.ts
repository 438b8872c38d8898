// The gate's policy: its rules and their defaults — the one place these numbers live
// (docs/scoring.md writes them out as a complete example policy; a test keeps the two equal).
// Every rule may be set to null in a policy file: the rule is then off (a numeric allowance is not
// checked, an `allow…` rule allows, a `block…` rule does not block).

export interface GateRules {
  /** A run that passed on the baseline and fails (or errors) on the candidate. */
  allowNewFailures: boolean | null;
  /** Runs failing on both sides ("still failing") block too; by default they are only listed. */
  blockStillFailing: boolean | null;
  /** A baseline run the candidate did not run (missing coverage) is allowed. */
  allowMissingRuns: boolean | null;
  /** Allowed drop of the stance margin's min, stanceMargin.min (absolute, margin units). */
  frictionMarginMinLoss: number | null;
  /** Allowed drop of stanceMargin.p05 (absolute). */
  frictionMarginP05Loss: number | null;
  /** Slip distance may grow by this fraction of the baseline … */
  slipDistanceGrowthFraction: number | null;
  /** … and by this many metres: a breach must exceed both allowances. */
  slipDistanceGrowth_m: number | null;
  /** Slip per touchdown (touchdown.slip_m.mean) may grow by this fraction of the baseline … */
  touchdownSlipGrowthFraction: number | null;
  /** … and by this many metres per touchdown: a breach must exceed both allowances. */
  touchdownSlipGrowth_m: number | null;
  /** A run that fell where the baseline stood. */
  allowNewFalls: boolean | null;
  /** More commanded friction-cone violation intervals than the baseline. */
  allowNewCommandedViolations: boolean | null;
  /**
   * Allowed slowdown of the candidate's tick against the baseline's, as a fraction, judged on the
   * paired measurement (harness/bench/pairedTiming.ts): blocks only when the whole confidence
   * interval of the median time ratio lies above 1 + this fraction.
   */
  loopTimeSlowdownFraction: number | null;
  /** The candidate's tick over the scenario's loop budget, judged on the paired measurement. */
  allowLoopTimeOverBudget: boolean | null;
  /**
   * Allowed growth of a single run's loop-time p99 (off by default: one pass's p99 moves with the
   * machine's load, so it is reported, not gated; set a fraction to gate it anyway).
   */
  loopTimeP99GrowthFraction: number | null;
  /** Allowed drop of a governor update rate (bench data; validated, not applied to run results). */
  governorRateDrop: number | null;
  /** Allowed rise of margin.friction.criticalScale (footing margin): the build needing more grip. */
  criticalFrictionScaleRise: number | null;
  /** Allowed drop of margin.push.criticalScale (footing margin). */
  criticalPushScaleDrop: number | null;
  /** A family's success rate may drop by this much before a supported drop blocks (0: any). */
  familySuccessRateDrop: number | null;
  /** Confidence of the family drop test (Newcombe 1998 interval), e.g. 0.95. */
  familyConfidence: number;
}

export const GATE_RULE_NAMES = [
  'allowNewFailures',
  'blockStillFailing',
  'allowMissingRuns',
  'frictionMarginMinLoss',
  'frictionMarginP05Loss',
  'slipDistanceGrowthFraction',
  'slipDistanceGrowth_m',
  'touchdownSlipGrowthFraction',
  'touchdownSlipGrowth_m',
  'allowNewFalls',
  'allowNewCommandedViolations',
  'loopTimeSlowdownFraction',
  'allowLoopTimeOverBudget',
  'loopTimeP99GrowthFraction',
  'governorRateDrop',
  'criticalFrictionScaleRise',
  'criticalPushScaleDrop',
  'familySuccessRateDrop',
  'familyConfidence',
] as const satisfies readonly (keyof GateRules)[];

export const DEFAULT_GATE_RULES: Readonly<GateRules> = Object.freeze({
  // Only what the candidate changed blocks: a failure it introduced, not one it inherited.
  allowNewFailures: false,
  blockStillFailing: false,
  // A scenario the candidate skipped is not evidence that it holds.
  allowMissingRuns: false,
  // 0.02 of margin is about the run-to-run spread of p05 between builds that differ only in
  // numerics (common practice: tolerate noise, catch a lost safety factor). Judged on the stance
  // margin: the whole-run minimum is a touchdown sample set by the contact law and the step.
  frictionMarginMinLoss: 0.02,
  frictionMarginP05Loss: 0.02,
  // +20 % alone would flag 1 mm → 1.3 mm of creep; +0.01 m alone would hide a doubling of a small
  // slip. Requiring both keeps the rule quiet on noise and loud on real sliding.
  slipDistanceGrowthFraction: 0.2,
  slipDistanceGrowth_m: 0.01,
  // Per touchdown: the same +20 % as the whole-run slip (one reason for both), and 0.5 mm, above
  // the error of the default step on a landing (0.13 mm per touchdown against a 4× finer step on
  // the dry walk, docs/scoring.md) so refining numerics never trips it, and a fortieth of the
  // bundled feet's 2 cm radius, so a landing that skids visibly does.
  touchdownSlipGrowthFraction: 0.2,
  touchdownSlipGrowth_m: 0.0005,
  allowNewFalls: false,
  allowNewCommandedViolations: false,
  // Paired, interleaved timing removes the machine's drift; what is left is the build's cost. 25 %
  // is above the ±10–20 % that differing inlining decisions move a controller tick by (common
  // practice) and far below the cost of a real algorithmic change.
  loopTimeSlowdownFraction: 0.25,
  allowLoopTimeOverBudget: false,
  loopTimeP99GrowthFraction: null,
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
