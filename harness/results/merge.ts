// Result sets combined into one (shards by `footing merge`, several sets by `footing report`).
// Refuses mixed tool versions, and one scenario id that carries different content hashes in
// different sets.

import { createResultsFile } from './runResult.js';
import type { BuildManifest, ResultsFile, RunResult } from './types.js';

export function mergeResultSets(sets: { file: string; results: ResultsFile }[]): ResultsFile {
  if (sets.length === 0) throw new MergeError('nothing to merge: name at least one results folder');
  const version = sets[0].results.toolVersion;
  const hashes = new Map<string, { hash: string; file: string }>();
  const builds = new Map<string, BuildManifest>();
  const runs = new Map<string, RunResult>();
  let startedAt = sets[0].results.startedAt;
  for (const { file, results } of sets) {
    if (results.toolVersion !== version) {
      throw new MergeError(`${file}: made by footing ${results.toolVersion}, but ${sets[0].file} by ${version}; merge results of one tool version`);
    }
    if (results.startedAt < startedAt) startedAt = results.startedAt;
    for (const b of results.builds) if (!builds.has(b.name)) builds.set(b.name, b);
    for (const run of results.runs) {
      const seen = hashes.get(run.scenario.id);
      if (seen && seen.hash !== run.scenario.hash) {
        throw new MergeError(`${file}: scenario ${run.scenario.id} has hash ${run.scenario.hash.slice(0, 12)}…, but ${seen.file} has ${seen.hash.slice(0, 12)}…; the shards ran different scenario versions`);
      }
      hashes.set(run.scenario.id, { hash: run.scenario.hash, file });
      runs.set(`${run.scenario.id}\u0000${run.build}`, run);
    }
  }
  // The order an unsharded run gives: scenarios by file then id, builds as first listed.
  const buildOrder = [...builds.keys()];
  const ordered = [...runs.values()].sort(
    (a, b) =>
      compare(a.scenario.file, b.scenario.file) || compare(a.scenario.id, b.scenario.id) || buildOrder.indexOf(a.build) - buildOrder.indexOf(b.build),
  );
  return createResultsFile({ toolVersion: version, builds: [...builds.values()], startedAt, machine: sets[0].results.machine, runs: ordered });
}

export class MergeError extends Error {}

function compare(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}
