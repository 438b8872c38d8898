// Result sets combined into one (shards by `footing merge`, several sets by `footing report`).
// Refuses mixed tool versions, and one scenario id that carries different content hashes in
// different sets.

import { createResultsFile } from './runResult.js';
import type { BuildManifest, ResultsFile, RunResult } from './types.js';

/**
 * Shards of one suite must all be there, once each, and be of the same suite: a merge of 1 of 2
 * shards would look like a smaller suite that passed. Sets without shard records (whole runs)
 * merge as before, but not mixed with shards.
 */
export function checkShards(sets: { file: string; results: ResultsFile }[]): void {
  const sharded = sets.filter((s) => s.results.shard !== undefined);
  if (sharded.length === 0) return;
  if (sharded.length !== sets.length) {
    const whole = sets.find((s) => s.results.shard === undefined) as { file: string };
    throw new MergeError(`${whole.file} is not a shard, but ${sharded[0].file} is shard ${sharded[0].results.shard!.index}/${sharded[0].results.shard!.count}; merge the shards of one suite, or whole result sets, not both`);
  }
  const first = sharded[0];
  const { count, suite } = first.results.shard!;
  const byIndex = new Map<number, string>();
  for (const { file, results } of sharded) {
    const shard = results.shard!;
    if (shard.count !== count || shard.suite !== suite) {
      throw new MergeError(`${file} is shard ${shard.index}/${shard.count} of a different suite than ${first.file} (shard ${first.results.shard!.index}/${count}); the shards ran different scenarios, builds or shard counts`);
    }
    const seen = byIndex.get(shard.index);
    if (seen !== undefined) throw new MergeError(`shard ${shard.index}/${count} is given twice: ${seen} and ${file}`);
    byIndex.set(shard.index, file);
  }
  const missing = Array.from({ length: count }, (_, k) => k + 1).filter((k) => !byIndex.has(k));
  if (missing.length > 0) {
    throw new MergeError(`shard${missing.length === 1 ? '' : 's'} ${missing.join(', ')} of ${count} missing (given: ${[...byIndex.keys()].sort((a, b) => a - b).join(', ')}); merge every shard of the suite, or the merged result would hide runs that never ran`);
  }
}

export function mergeResultSets(sets: { file: string; results: ResultsFile }[]): ResultsFile {
  if (sets.length === 0) throw new MergeError('nothing to merge: name at least one results folder');
  checkShards(sets);
  const version = sets[0].results.toolVersion;
  const hashes = new Map<string, { hash: string; file: string }>();
  const builds = new Map<string, BuildManifest>();
  const runs = new Map<string, RunResult>();
  const owners = new Map<string, string>();
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
      const key = `${run.scenario.id}\u0000${run.build}`;
      const earlier = owners.get(key);
      if (earlier !== undefined) throw new MergeError(`${file}: the run of ${run.scenario.id} × ${run.build} is also in ${earlier}; each run must come from one set`);
      owners.set(key, file);
      runs.set(key, run);
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
