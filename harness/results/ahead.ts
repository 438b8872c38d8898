// "Ahead" (docs/scoring.md, Ahead): is one build's run of a scenario better than another build's run
// of the same scenario, judged only by numbers the scorer already has? Used by summary.md to show
// the gate's baseline build against the nominal reference build on every slippery scenario.

import { isSlippery } from './slippery.js';
import type { BuildManifest, ResultsFile, RunResult } from './types.js';

/**
 * How much counts as a difference. The defaults are the merge gate's default allowances
 * (harness/gate/defaults.ts): a slip difference counts when it is larger than both slip-growth
 * allowances, a margin difference when it is larger than the margin-loss allowance, so "ahead" on
 * numbers means "the gate would call the other run a regression of this one". The command layer
 * passes the run's own policy; this layer cannot import the gate.
 */
export interface AheadAllowances {
  frictionMarginMinLoss: number;
  slipDistanceGrowth_m: number;
  slipDistanceGrowthFraction: number;
}

export const DEFAULT_AHEAD_ALLOWANCES: AheadAllowances = {
  frictionMarginMinLoss: 0.02,
  slipDistanceGrowth_m: 0.01,
  slipDistanceGrowthFraction: 0.2,
};

/** The gate's comparisons allow the same 10⁻⁹ slack, so exactly the allowance is not a difference. */
const SLACK = 1e-9;

/** Verdicts from worst to best: an error, a fall, a failed check, a pass. */
export type Verdict = 'error' | 'fell' | 'fail' | 'pass';
const VERDICT_RANK: Record<Verdict, number> = { error: 0, fell: 1, fail: 2, pass: 3 };

export function verdictOf(run: RunResult): Verdict {
  if (run.status === 'error') return 'error';
  if (run.status === 'pass') return 'pass';
  return run.metrics?.fell ? 'fell' : 'fail';
}

/** The margin the acceptance check reads: the stance margin, else (older results) the whole run's. */
export function stanceMarginMin(run: RunResult): number | null {
  const metrics = run.metrics;
  if (metrics === null) return null;
  return (metrics.stanceMargin ?? metrics.frictionMargin).min;
}

export type AheadReason = 'better verdict' | 'less slip' | 'worse verdict' | 'lower margin' | 'not less slip' | 'not measured';

export interface AheadJudgement {
  ahead: boolean;
  /** Why, in the words of the rule (docs/scoring.md). */
  reason: AheadReason;
}

/**
 * Is `leader` ahead of `other` on one scenario? Ahead when its verdict is no worse and either its
 * verdict is better, or its slip is smaller by more than both slip allowances at a stance margin
 * no lower than the other's less the margin allowance.
 */
export function judgeAhead(leader: RunResult, other: RunResult, allowances: AheadAllowances = DEFAULT_AHEAD_ALLOWANCES): AheadJudgement {
  const rankLeader = VERDICT_RANK[verdictOf(leader)];
  const rankOther = VERDICT_RANK[verdictOf(other)];
  if (rankLeader < rankOther) return { ahead: false, reason: 'worse verdict' };
  if (rankLeader > rankOther) return { ahead: true, reason: 'better verdict' };
  const slipLeader = leader.metrics?.slipDistance_m;
  const slipOther = other.metrics?.slipDistance_m;
  const marginLeader = stanceMarginMin(leader);
  const marginOther = stanceMarginMin(other);
  if (slipLeader === undefined || slipOther === undefined) return { ahead: false, reason: 'not measured' };
  const lessSlip =
    slipOther - slipLeader > allowances.slipDistanceGrowth_m + SLACK &&
    slipOther > slipLeader * (1 + allowances.slipDistanceGrowthFraction) + SLACK;
  if (!lessSlip) return { ahead: false, reason: 'not less slip' };
  // A leader with no stance sample has no margin to show; one whose rival has none is not lower.
  if (marginOther !== null && (marginLeader === null || marginOther - marginLeader > allowances.frictionMarginMinLoss + SLACK)) {
    return { ahead: false, reason: 'lower margin' };
  }
  return { ahead: true, reason: 'less slip' };
}

export interface AheadRow {
  scenario: string;
  lowestStaticFriction: number;
  leader: RunResult;
  other: RunResult;
  judgement: AheadJudgement;
}

export interface AheadTable {
  leaderBuild: string;
  otherBuild: string;
  rows: AheadRow[];
  /** Slippery scenarios that one of the two builds did not run (listed, not counted). */
  unpaired: string[];
}

/** The nominal reference build as run: `ref:nominal` without options, whatever it was named. */
export function isNominalReference(build: BuildManifest): boolean {
  const options = build.options;
  const plain = options === undefined || (typeof options === 'object' && options !== null && Object.keys(options).length === 0);
  return build.kind === 'reference' && build.entry === 'nominal' && plain;
}

export type AheadBuilds = { leader: string; other: string } | { missing: string };

/**
 * Which two builds the table compares: the gate's baseline build (else the governed reference
 * build) against the nominal reference build. `missing` says why there is no table.
 */
export function aheadBuilds(results: ResultsFile, baseline?: string): AheadBuilds {
  const nominal = results.builds.find(isNominalReference);
  if (nominal === undefined) return { missing: 'the nominal reference build (ref:nominal) did not run' };
  let leader = baseline;
  if (leader === undefined) {
    leader = results.builds.find((b) => b.kind === 'reference' && b.entry === 'governed' && b.name !== nominal.name)?.name;
    if (leader === undefined) return { missing: 'no baseline build was named (--baseline) and the governed reference build did not run' };
  }
  if (leader === nominal.name) return { missing: `the baseline build ${leader} is the nominal reference build itself` };
  if (!results.builds.some((b) => b.name === leader)) return { missing: `the baseline build ${leader} did not run` };
  return { leader, other: nominal.name };
}

/**
 * Every slippery scenario of the results (by its recorded lowestStaticFriction; runs written
 * before it existed are skipped), judged leader against other, in the order the runs hold.
 */
export function aheadTable(results: ResultsFile, leaderBuild: string, otherBuild: string, allowances?: AheadAllowances): AheadTable {
  const byScenario = new Map<string, { lowest: number; leader?: RunResult; other?: RunResult }>();
  for (const run of results.runs) {
    const lowest = run.scenario.lowestStaticFriction;
    if (lowest === undefined || !isSlippery(lowest)) continue;
    if (run.build !== leaderBuild && run.build !== otherBuild) continue;
    let entry = byScenario.get(run.scenario.id);
    if (entry === undefined) {
      entry = { lowest };
      byScenario.set(run.scenario.id, entry);
    }
    if (run.build === leaderBuild) entry.leader = run;
    else entry.other = run;
  }
  const rows: AheadRow[] = [];
  const unpaired: string[] = [];
  for (const [scenario, entry] of byScenario) {
    if (entry.leader === undefined || entry.other === undefined) {
      unpaired.push(scenario);
      continue;
    }
    rows.push({ scenario, lowestStaticFriction: entry.lowest, leader: entry.leader, other: entry.other, judgement: judgeAhead(entry.leader, entry.other, allowances) });
  }
  return { leaderBuild, otherBuild, rows, unpaired };
}
