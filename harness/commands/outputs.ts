// Everything a results folder holds, written atomically: results.json, junit.xml, summary.md,
// report.html, gate.md when a baseline build was named, margin.md for `footing margin`.

import { mkdirSync } from 'node:fs';
import path from 'node:path';
import { renderReportHtml, type ReportOptions } from '../report/index.js';
import { writeFileAtomicSync } from '../files/atomic.js';
import { DEFAULT_GATE_RULES, type GatePolicy } from '../gate/defaults.js';
import type { GateOutcome } from '../gate/types.js';
import type { AheadAllowances } from '../results/ahead.js';
import { junitRunKey, writeJunitXml, type JunitRunChanges } from '../results/writeJunit.js';
import { writeResultsJson } from '../results/writeJson.js';
import { aheadSummaryLine, writeSummaryMarkdown } from '../results/writeSummary.js';
import { RESULTS_FILE_NAME, type ResultsFile } from '../results/types.js';

export const OUTPUT_FILES = {
  results: RESULTS_FILE_NAME,
  junit: 'junit.xml',
  summary: 'summary.md',
  report: 'report.html',
  gate: 'gate.md',
  margin: 'margin.md',
} as const;

/** Report options beyond the folder (baseline build, gate outcome, policy, shard folders). */
export type OutputOptions = Omit<ReportOptions, 'outDir'>;

/** The gate's run changes by candidate run, for junit.xml (new failures vs still failing). */
function runChangesOf(gate: GateOutcome): JunitRunChanges {
  const changes = new Map<string, 'new-failure' | 'still-failing' | 'fixed' | 'passing'>();
  for (const row of gate.rows) if (row.metric === 'status' && row.runChange) changes.set(junitRunKey(row.scenario, row.candidateBuild), row.runChange);
  return changes;
}

/** The ahead table counts a difference as the run's gate would (a rule set to null: its default). */
function aheadAllowances(policy: GatePolicy | undefined): AheadAllowances {
  const rules = policy?.rules;
  return {
    frictionMarginMinLoss: rules?.frictionMarginMinLoss ?? (DEFAULT_GATE_RULES.frictionMarginMinLoss as number),
    slipDistanceGrowth_m: rules?.slipDistanceGrowth_m ?? (DEFAULT_GATE_RULES.slipDistanceGrowth_m as number),
    slipDistanceGrowthFraction: rules?.slipDistanceGrowthFraction ?? (DEFAULT_GATE_RULES.slipDistanceGrowthFraction as number),
  };
}

/** summary.md's ahead count for the terminal, judged as summary.md judges it; null without a table. */
export function aheadLine(results: ResultsFile, baseline: string | undefined, policy: GatePolicy | undefined): string | null {
  return aheadSummaryLine(results, { baseline, allowances: aheadAllowances(policy) });
}

export function writeOutputs(outDir: string, results: ResultsFile, report: OutputOptions = {}): string[] {
  mkdirSync(outDir, { recursive: true });
  const written = [
    path.join(outDir, OUTPUT_FILES.results),
    path.join(outDir, OUTPUT_FILES.junit),
    path.join(outDir, OUTPUT_FILES.summary),
    path.join(outDir, OUTPUT_FILES.report),
  ];
  writeResultsJson(written[0], results);
  writeJunitXml(written[1], results, report.gate ? runChangesOf(report.gate) : undefined);
  writeSummaryMarkdown(written[2], results, { baseline: report.baseline, allowances: aheadAllowances(report.policy) });
  writeFileAtomicSync(written[3], renderReportHtml(results, { bench: results.bench, ...report, outDir }));
  return written;
}
