// `footing gate` as a function: pair two result sets, apply the policy to every pair, and answer
// hold or block.

import type { ResultsFile } from '../results/types.js';
import { rulesFor, type GatePolicy } from './defaults.js';
import { pairRuns } from './pairing.js';
import { compareFamilies } from './familyRules.js';
import { governorRateRows } from './governorRate.js';
import { compareMargins } from './marginRules.js';
import { compareRuns } from './rules.js';
import { GateInputError, type GateOutcome, type GateRow } from './types.js';

export interface GateInput {
  baseline: ResultsFile;
  candidate: ResultsFile;
  policy: GatePolicy;
  /** Explicit build pairs [baseline name, candidate name]. */
  pairs?: [string, string][];
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
  // Stable sort: broken rows first, otherwise in pairing order (scenario order of the baseline).
  const ordered = [...rows.filter((r) => r.broken), ...rows.filter((r) => !r.broken)];
  const comparedIds = new Set(pairing.pairs.map((p) => p.baseline.scenario.id));
  for (const r of families.rows) comparedIds.add(r.scenario);
  const warnings = Object.keys(input.policy.overrides)
    .filter((id) => !comparedIds.has(id))
    .map((id) => `policy override for scenario "${id}" matched no compared run`);
  return {
    verdict: rows.some((r) => r.broken) ? 'block' : 'hold',
    rows: ordered,
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
  });
}
