// The order in which builds are listed: as in the manifest list, then any build named only by runs.

import type { ResultsFile, RunResult } from './types.js';

export function buildNames(results: Pick<ResultsFile, 'builds' | 'runs'>): string[] {
  const names: string[] = [];
  const seen = new Set<string>();
  for (const name of [...results.builds.map((b) => b.name), ...results.runs.map((r) => r.build)]) {
    if (!seen.has(name)) {
      seen.add(name);
      names.push(name);
    }
  }
  return names;
}

export function runsByBuild(results: Pick<ResultsFile, 'builds' | 'runs'>): Map<string, RunResult[]> {
  const groups = new Map<string, RunResult[]>();
  for (const name of buildNames(results)) groups.set(name, []);
  for (const run of results.runs) groups.get(run.build)!.push(run);
  return groups;
}
