// `footing gate` as a function: pair two result sets, apply the policy to every pair, and answer
// hold or block.

import type { ResultsFile } from '../results/types.js';
import { rulesFor, type GatePolicy } from './defaults.js';
import { pairRuns } from './pairing.js';
import { compareFamilies } from './familyRules.js';
import { governorRateRows } from './governorRate.js';
import { compareMargins } from './marginRules.js';
import { loopTimeRows, type PairedLoopTimeRecord } from './loopTimeRules.js';
import { compareRuns } from './rules.js';
import { RUN_CHANGES, type RunChange } from './runChange.js';
import { GateInputError, type GateOutcome, type GateRow, type Unpaired } from './types.js';

export interface GateInput {
  baseline: ResultsFile;
  candidate: ResultsFile;
  policy: GatePolicy;
  /** Explicit build pairs [baseline name, candidate name]. */
  pairs?: [string, string][];
  /** Paired loop-time measurements of build pairs (footing run --baseline measures them). */
  loopTime?: readonly PairedLoopTimeRecord[];
}

/** A baseline run the candidate did not run: coverage lost, blocking unless allowed. */
function coverageRow(u: Unpaired, candidateOf: Map<string, string>, allowMissing: boolean | null): GateRow {
  const candidateBuild = candidateOf.get(u.build) ?? '';
  const on = allowMissing === false;
  return {
    scenario: u.scenario ?? '', baselineBuild: u.build, candidateBuild, metric: 'coverage',
    baseline: 'ran', candidate: 'not run', change: 'not run', rule: on ? 'every baseline run is run' : null, broken: on,
    ...(on ? { reason: `not run: the candidate has no run of this scenario (the baseline does)` } : {}),
  };
}

export function gate(input: GateInput): GateOutcome {
  const pairing = pairRuns(input.baseline, input.candidate, input.pairs);
  const rows: GateRow[] = [];
  for (const pair of pairing.pairs) {
    // A family's samples are judged together by their success rate (familyRules.ts): one sample
    // failing where its twin passed is within the family's noise, not a regression by itself.
    if (pair.baseline.scenario.family) continue;
    const rules = rulesFor(input.policy, pair.baseline.scenario.id);
    rows.push(...compareRuns(pair, rules), ...compareMargins(pair, rules));
  }
  const families = compareFamilies(input.baseline, input.candidate, pairing.buildPairs, input.policy);
  rows.push(...families.rows);
  // Bench figures are per build, not per scenario: the policy's defaults apply.
  rows.push(...governorRateRows(input.baseline, input.candidate, pairing.buildPairs, input.policy.rules));
  rows.push(...loopTimeRows(input.loopTime ?? [], pairing.buildPairs, input.policy.rules));
  const candidateOf = new Map(pairing.buildPairs);
  for (const u of pairing.unpaired) {
    if (u.side === 'baseline' && u.scenario !== null) rows.push(coverageRow(u, candidateOf, rulesFor(input.policy, u.scenario).allowMissingRuns));
  }
  for (const r of rows) {
    const rules = rulesFor(input.policy, r.scenario);
    r.blocking = r.broken && (r.preExisting !== true || rules.blockStillFailing === true);
  }
  // Stable sort: blocking rows first, then pre-existing breaks, otherwise pairing order.
  const ordered = [
    ...rows.filter((r) => r.blocking),
    ...rows.filter((r) => r.broken && !r.blocking),
    ...rows.filter((r) => !r.broken),
  ];
  const runChanges = Object.fromEntries(RUN_CHANGES.map((c) => [c, 0])) as Record<RunChange, number>;
  for (const pair of pairing.pairs) {
    if (pair.baseline.scenario.family) continue;
    const change = rows.find((r) => r.metric === 'status' && r.scenario === pair.baseline.scenario.id && r.candidateBuild === pair.candidate.build)?.runChange ?? 'passing';
    runChanges[change]++;
  }
  const comparedIds = new Set(pairing.pairs.map((p) => p.baseline.scenario.id));
  for (const r of families.rows) comparedIds.add(r.scenario);
  const warnings = Object.keys(input.policy.overrides)
    .filter((id) => !comparedIds.has(id))
    .map((id) => `policy override for scenario "${id}" matched no compared run`);
  return {
    verdict: rows.some((r) => r.blocking) ? 'block' : 'hold',
    rows: ordered,
    runChanges,
    notComparable: [...pairing.notComparable, ...families.notComparable],
    unpaired: pairing.unpaired,
    compared: pairing.pairs.length,
    buildPairs: pairing.buildPairs,
    warnings,
  };
}

/**
 * Gates builds of one result set against one of them (`footing run --baseline NAME`): every other
 * build (or those listed) is a candidate paired with NAME.
 */
export function gateWithinResults(
  results: ResultsFile,
  baselineBuild: string,
  policy: GatePolicy,
  candidateBuilds?: string[],
  loopTime?: readonly PairedLoopTimeRecord[],
): GateOutcome {
  const present = [...new Set(results.runs.map((r) => r.build))];
  if (!present.includes(baselineBuild)) {
    throw new GateInputError(`--baseline ${baselineBuild}: no build of that name in this run (builds: ${present.join(', ') || 'none'})`);
  }
  const candidates = candidateBuilds ?? present.filter((name) => name !== baselineBuild);
  for (const name of candidates) {
    if (name === baselineBuild || !present.includes(name)) {
      throw new GateInputError(`candidate build "${name}" is not another build of this run (builds: ${present.join(', ')})`);
    }
  }
  if (candidates.length === 0) throw new GateInputError(`--baseline ${baselineBuild}: the run has no other build to compare with`);
  const only = (names: string[]): ResultsFile => ({
    ...results,
    builds: results.builds.filter((b) => names.includes(b.name)),
    runs: results.runs.filter((r) => names.includes(r.build)),
  });
  return gate({
    baseline: only([baselineBuild]),
    candidate: only(candidates),
    policy,
    pairs: candidates.map((name) => [baselineBuild, name]),
    loopTime,
  });
}
