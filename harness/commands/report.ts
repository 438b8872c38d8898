// `footing report RESULTS... --out FILE`: re-renders the report from saved results (their series
// files and traces), without running anything. Several results sets are merged the way
// `footing merge` merges shards. Exit 0 all runs pass, 1 some run failed or errored, 2 bad input.

import { readFileSync } from 'node:fs';
import path from 'node:path';
import { writeFileAtomicSync } from '../files/atomic.js';
import { mergeResultSets, MergeError } from '../results/merge.js';
import { readResultsFile, ResultsReadError } from '../results/read.js';
import type { ResultsFile } from '../results/types.js';
import { buildReportModel } from '../report/model.js';
import { renderModel } from '../report/render.js';
import { EXIT, exitCodeOfRuns } from './exit.js';
import type { CommandOutcome } from './skeleton.js';

export interface ReportCommandArgs {
  results: string[];
  out: string;
  baseline?: string;
  /** Bench JSON file (#7) to show in the bench section. */
  bench?: string;
  cwd?: string;
}

export async function runReportCommand(args: ReportCommandArgs): Promise<CommandOutcome> {
  const cwd = args.cwd ?? process.cwd();
  if (args.results.length === 0) return { exitCode: EXIT.badInput, lines: ['footing report: name at least one results.json or results folder'] };
  if (!args.out) return { exitCode: EXIT.badInput, lines: ['footing report: --out FILE is required (the HTML file to write)'] };
  const out = path.resolve(cwd, args.out);
  if (!out.endsWith('.html') && !out.endsWith('.htm')) {
    return { exitCode: EXIT.badInput, lines: [`footing report: --out ${args.out}: expected an .html file name`] };
  }
  let sets: { file: string; results: ResultsFile }[];
  let results: ResultsFile;
  try {
    sets = args.results.map((p) => readResultsFile(path.resolve(cwd, p)));
    results = sets.length === 1 ? sets[0].results : mergeResultSets(sets);
  } catch (error) {
    if (error instanceof ResultsReadError || error instanceof MergeError) return { exitCode: EXIT.badInput, lines: [error.message] };
    throw error;
  }
  const names = new Set(results.runs.map((r) => r.build));
  if (args.baseline !== undefined && !names.has(args.baseline)) {
    return { exitCode: EXIT.badInput, lines: [`footing report: --baseline ${args.baseline}: no build of that name in the results (builds: ${[...names].join(', ')})`] };
  }
  let bench: unknown;
  if (args.bench) {
    const file = path.resolve(cwd, args.bench);
    try {
      bench = JSON.parse(readFileSync(file, 'utf8'));
    } catch (error) {
      return { exitCode: EXIT.badInput, lines: [`footing report: --bench ${file}: cannot read it as JSON (${(error as Error).message})`] };
    }
  }
  const html = renderModel(buildReportModel(results, {
    outDir: path.dirname(out),
    baseline: args.baseline,
    bench,
    sourceDirs: sets.map((s) => path.dirname(s.file)),
  }));
  writeFileAtomicSync(out, html);
  return {
    exitCode: exitCodeOfRuns(results.runs),
    lines: [`report of ${results.runs.length} runs from ${sets.length} results set${sets.length === 1 ? '' : 's'} → ${path.relative(cwd, out) || out} (${Math.round(html.length / 1024)} KB)`],
  };
}
