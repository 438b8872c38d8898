// Pairing runs of a baseline and a candidate result set: builds first (one build each side → pair
// them whatever their names; explicit pairs when given; else equal names), then runs of a build
// pair by scenario id, compared only when the scenario hash is equal.

import { compareIdentity } from '../scenario/identity.js';
import { buildNames } from '../results/buildOrder.js';
import type { ResultsFile, RunResult } from '../results/types.js';
import { GateInputError, type NotComparable, type Unpaired } from './types.js';

export interface RunPair {
  baseline: RunResult;
  candidate: RunResult;
}

export interface Pairing {
  buildPairs: [string, string][];
  pairs: RunPair[];
  notComparable: NotComparable[];
  unpaired: Unpaired[];
}

function namesWithRuns(results: ResultsFile): string[] {
  const used = new Set(results.runs.map((r) => r.build));
  return buildNames(results).filter((name) => used.has(name));
}

function byScenario(runs: RunResult[], side: string, build: string): Map<string, RunResult> {
  const map = new Map<string, RunResult>();
  for (const run of runs) {
    if (run.build !== build) continue;
    if (map.has(run.scenario.id)) {
      throw new GateInputError(`${side} holds two runs of scenario "${run.scenario.id}" for build "${build}"`);
    }
    map.set(run.scenario.id, run);
  }
  return map;
}

export function chooseBuildPairs(
  baseline: ResultsFile,
  candidate: ResultsFile,
  explicit?: readonly [string, string][],
): [string, string][] {
  const baseBuilds = namesWithRuns(baseline);
  const candBuilds = namesWithRuns(candidate);
  if (explicit !== undefined && explicit.length > 0) {
    for (const [base, cand] of explicit) {
      if (!baseBuilds.includes(base)) {
        throw new GateInputError(`pair ${base}=${cand}: the baseline has no build "${base}" (it has: ${baseBuilds.join(', ') || 'no runs'})`);
      }
      if (!candBuilds.includes(cand)) {
        throw new GateInputError(`pair ${base}=${cand}: the candidate has no build "${cand}" (it has: ${candBuilds.join(', ') || 'no runs'})`);
      }
    }
    return explicit.map(([b, c]) => [b, c]);
  }
  if (baseBuilds.length === 1 && candBuilds.length === 1) return [[baseBuilds[0], candBuilds[0]]];
  return baseBuilds.filter((name) => candBuilds.includes(name)).map((name) => [name, name]);
}

export function pairRuns(baseline: ResultsFile, candidate: ResultsFile, explicit?: readonly [string, string][]): Pairing {
  const buildPairs = chooseBuildPairs(baseline, candidate, explicit);
  const pairs: RunPair[] = [];
  const notComparable: NotComparable[] = [];
  const unpaired: Unpaired[] = [];

  const pairedBase = new Set(buildPairs.map(([b]) => b));
  const pairedCand = new Set(buildPairs.map(([, c]) => c));
  for (const build of namesWithRuns(baseline)) {
    if (!pairedBase.has(build)) unpaired.push({ side: 'baseline', build, scenario: null, reason: 'no candidate build to pair with' });
  }
  for (const build of namesWithRuns(candidate)) {
    if (!pairedCand.has(build)) unpaired.push({ side: 'candidate', build, scenario: null, reason: 'no baseline build to pair with' });
  }

  for (const [baseBuild, candBuild] of buildPairs) {
    const baseRuns = byScenario(baseline.runs, 'the baseline', baseBuild);
    const candRuns = byScenario(candidate.runs, 'the candidate', candBuild);
    for (const [id, base] of baseRuns) {
      const cand = candRuns.get(id);
      if (cand === undefined) {
        unpaired.push({ side: 'baseline', build: baseBuild, scenario: id, reason: `not run by candidate build "${candBuild}"` });
      } else if (cand.scenario.hash !== base.scenario.hash) {
        notComparable.push({
          scenario: id,
          baselineBuild: baseBuild,
          candidateBuild: candBuild,
          baselineHash: base.scenario.hash,
          candidateHash: cand.scenario.hash,
          reason: scenarioChange(base, cand),
        });
      } else if (base.status === 'error') {
        notComparable.push({
          scenario: id,
          baselineBuild: baseBuild,
          candidateBuild: candBuild,
          baselineHash: base.scenario.hash,
          candidateHash: cand.scenario.hash,
          reason: `baseline run errored: ${base.error?.message ?? base.reasons.join('; ')}`,
        });
      } else {
        pairs.push({ baseline: base, candidate: cand });
      }
    }
    for (const id of candRuns.keys()) {
      if (!baseRuns.has(id)) {
        unpaired.push({ side: 'candidate', build: candBuild, scenario: id, reason: `not run by baseline build "${baseBuild}"` });
      }
    }
  }
  return { buildPairs, pairs, notComparable, unpaired };
}

/** Why two runs of one scenario id are not comparable; warns when the revision was not bumped. */
function scenarioChange(base: RunResult, cand: RunResult): string {
  const identity = compareIdentity(base.scenario, cand.scenario);
  if (identity.kind === 'changedWithoutRevision') return `warning: ${identity.message}`;
  return `scenario changed (revision ${base.scenario.revision} → ${cand.scenario.revision}, hash ${base.scenario.hash.slice(0, 12)} → ${cand.scenario.hash.slice(0, 12)})`;
}

/** `--pair BASE=CAND` texts as build-name pairs; a malformed one is a GateInputError. */
export function parsePairs(pairs: readonly string[]): [string, string][] {
  return pairs.map((text) => {
    const at = text.indexOf('=');
    const base = text.slice(0, at).trim();
    const cand = text.slice(at + 1).trim();
    if (at < 0 || base === '' || cand === '' || cand.includes('=')) {
      throw new GateInputError(`--pair "${text}": expected BASE=CAND, two build names joined by "="`);
    }
    return [base, cand];
  });
}
