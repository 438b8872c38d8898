// `footing merge DIR... --out DIR`: shard result folders combined into one results folder.

import { copyFileSync, existsSync, mkdirSync } from 'node:fs';
import path from 'node:path';
import type { ResultsFile } from '../results/types.js';
import { seriesPath } from '../score/series/file.js';
import { mergeResultSets, MergeError } from '../results/merge.js';
import { readResultsFile, ResultsReadError } from '../results/read.js';
import { EXIT, exitCodeOfRuns } from './exit.js';
import { writeOutputs } from './outputs.js';
import type { CommandOutcome } from './skeleton.js';

/**
 * Copies each merged run's series file (and trace, when kept) into the merged folder, so the
 * merged folder stands alone: `footing report` on it finds every plot without the shard folders.
 */
function carryRunFiles(sets: { file: string }[], merged: ResultsFile, outDir: string): number {
  let copied = 0;
  const roots = sets.map((set) => path.dirname(set.file));
  for (const run of merged.runs) {
    const relatives = [seriesPath(run.scenario.id, run.build), ...(run.trace ? [run.trace] : [])];
    for (const relative of relatives) {
      const source = roots.map((root) => path.join(root, relative)).find((file) => existsSync(file));
      if (source === undefined) continue;
      const target = path.join(outDir, relative);
      if (path.resolve(source) === path.resolve(target)) continue;
      mkdirSync(path.dirname(target), { recursive: true });
      copyFileSync(source, target);
      copied++;
    }
  }
  return copied;
}

export function mergeResults(dirs: string[], outDir: string): CommandOutcome {
  try {
    const sets = dirs.map((dir) => readResultsFile(dir));
    const merged = mergeResultSets(sets);
    const out = path.resolve(outDir);
    mkdirSync(out, { recursive: true });
    const copied = carryRunFiles(sets, merged, out);
    writeOutputs(out, merged, { sourceDirs: [out, ...dirs.map((dir) => path.resolve(dir))] });
    return { exitCode: exitCodeOfRuns(merged.runs), lines: [`merged ${dirs.length} result sets, ${merged.runs.length} runs (${copied} series and trace files carried) → ${outDir}`] };
  } catch (error) {
    if (error instanceof MergeError || error instanceof ResultsReadError) return { exitCode: EXIT.badInput, lines: [error.message] };
    throw error;
  }
}
