// What the gate answers: every metric that moved between paired runs (with the rule that judges
// it and whether it is broken), plus the runs it could not or would not compare.

import type { RunChange } from './runChange.js';

export type GateVerdict = 'hold' | 'block';

export type GateValue = number | boolean | string | null;

export interface GateRow {
  scenario: string;
  baselineBuild: string;
  candidateBuild: string;
  /** Metric path in the run result, e.g. 'frictionMargin.min', 'loopTime_us.p99', 'status'. */
  metric: string;
  baseline: GateValue;
  candidate: GateValue;
  /** Human change, e.g. '−0.031', '+35 %', 'no → yes'. */
  change: string;
  /** The allowance applied, e.g. 'loss ≤ 0.02'; null for a metric shown for information only. */
  rule: string | null;
  /** The rule is broken (whether that blocks depends on `preExisting` and the policy). */
  broken: boolean;
  /**
   * The break was there on the baseline too (a run still failing): listed, blocking only when the
   * policy's blockStillFailing is on. Absent for breaks the candidate introduced.
   */
  preExisting?: boolean;
  /** Set by the gate: this row makes the verdict `block`. */
  blocking?: boolean;
  /** On `status` rows: how the run's own verdict changed. */
  runChange?: RunChange;
  /** Sentence saying what broke, when broken. */
  reason?: string;
}

export interface NotComparable {
  scenario: string;
  baselineBuild: string;
  candidateBuild: string;
  baselineHash: string;
  candidateHash: string;
  reason: string;
}

export interface Unpaired {
  side: 'baseline' | 'candidate';
  build: string;
  /** null: the whole build found no partner. */
  scenario: string | null;
  reason: string;
}

export interface GateOutcome {
  verdict: GateVerdict;
  /** Broken rows first, then by scenario, build and metric order. */
  rows: GateRow[];
  notComparable: NotComparable[];
  unpaired: Unpaired[];
  /** Run pairs compared. */
  compared: number;
  /** Compared run pairs by how their own verdict changed (families excluded). */
  runChanges: Record<RunChange, number>;
  /** Build pairs used, [baseline, candidate]. */
  buildPairs: [string, string][];
  /** E.g. overrides naming scenarios that were not compared. */
  warnings: string[];
}

/** Bad gate input (unknown build in a pair, duplicate runs): exit code 2. */
export class GateInputError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'GateInputError';
  }
}
