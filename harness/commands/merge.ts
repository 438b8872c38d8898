// `footing merge DIR... --out DIR`: shard result folders combined into one results folder.

import path from 'node:path';
import { mergeResultSets, MergeError } from '../results/merge.js';
import { readResultsFile, ResultsReadError } from '../results/read.js';
import { EXIT, exitCodeOfRuns } from './exit.js';
import { writeOutputs } from './outputs.js';
import type { CommandOutcome } from './skeleton.js';

export function mergeResults(dirs: string[], outDir: string): CommandOutcome {
  try {
    const sets = dirs.map((dir) => readResultsFile(dir));
    const merged = mergeResultSets(sets);
    writeOutputs(path.resolve(outDir), merged, { sourceDirs: dirs.map((dir) => path.resolve(dir)) });
    return { exitCode: exitCodeOfRuns(merged.runs), lines: [`merged ${dirs.length} result sets, ${merged.runs.length} runs → ${outDir}`] };
  } catch (error) {
    if (error instanceof MergeError || error instanceof ResultsReadError) return { exitCode: EXIT.badInput, lines: [error.message] };
    throw error;
  }
}
