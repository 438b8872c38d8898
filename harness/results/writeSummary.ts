// summary.md: a short Markdown digest for a merge-request comment — totals per build, the failing
// runs with their reasons, and the full table folded away.

import { writeFileAtomicSync } from '../files/atomic.js';
import { markdownCode, markdownInline } from '../files/markdown.js';
import { runsByBuild } from './buildOrder.js';
import type { ResultsFile, RunResult } from './types.js';

/** Failures listed in full before "… and N more" (keeps the comment short). */
export const SUMMARY_FAILURE_LIMIT = 20;

/** Build-supplied text in a table cell or list item: one inert line (harness/text/markdown.ts). */
export const markdownCell = markdownInline;

function fixed(value: number | null | undefined, decimals: number): string {
  return value === null || value === undefined ? '–' : value.toFixed(decimals);
}

function worst(runs: RunResult[], pick: (r: RunResult) => number | null | undefined, lowest: boolean): number | null {
  let best: number | null = null;
  for (const run of runs) {
    const v = pick(run);
    if (v === null || v === undefined) continue;
    if (best === null || (lowest ? v < best : v > best)) best = v;
  }
  return best;
}

const STATUS_MARK = { pass: '✅ pass', fail: '❌ fail', error: '⚠️ error' } as const;

export function renderSummaryMarkdown(results: ResultsFile): string {
  const runs = results.runs;
  const count = (status: string, list = runs) => list.filter((r) => r.status === status).length;
  const lines: string[] = [];
  lines.push(
    `### Footing: ${runs.length} runs — ${count('pass')} pass, ${count('fail')} fail, ${count('error')} error`,
    '',
    '| build | runs | pass | fail | error | worst margin (min) | worst slip (m) | falls |',
    '|---|---:|---:|---:|---:|---:|---:|---:|',
  );
  for (const [build, list] of runsByBuild(results)) {
    lines.push(
      `| ${markdownCell(build)} | ${list.length} | ${count('pass', list)} | ${count('fail', list)} | ${count('error', list)} | ` +
        `${fixed(worst(list, (r) => r.metrics?.frictionMargin.min, true), 3)} | ` +
        `${fixed(worst(list, (r) => r.metrics?.slipDistance_m, false), 4)} | ` +
        `${list.filter((r) => r.metrics?.fell).length} |`,
    );
  }
  const failing = runs.filter((r) => r.status !== 'pass');
  if (failing.length > 0) {
    lines.push('', '**Not passing**', '');
    for (const run of failing.slice(0, SUMMARY_FAILURE_LIMIT)) {
      lines.push(`- ${markdownCode(run.scenario.id)} × ${markdownCode(run.build)} (${run.status}): ${markdownInline(run.reasons.join('; '))}`);
    }
    if (failing.length > SUMMARY_FAILURE_LIMIT) lines.push(`- … and ${failing.length - SUMMARY_FAILURE_LIMIT} more`);
  }
  lines.push(
    '',
    '<details><summary>All runs</summary>',
    '',
    '| scenario | build | status | margin min | margin p05 | slip (m) | commanded viol. | fell | loop p99 (µs) |',
    '|---|---|---|---:|---:|---:|---:|---|---:|',
  );
  for (const run of runs) {
    const m = run.metrics;
    lines.push(
      `| ${markdownCell(run.scenario.id)} | ${markdownCell(run.build)} | ${STATUS_MARK[run.status]} | ` +
        `${fixed(m?.frictionMargin.min, 3)} | ${fixed(m?.frictionMargin.p05, 3)} | ${fixed(m?.slipDistance_m, 4)} | ` +
        `${m ? m.violations.commanded : '–'} | ${m ? (m.fell ? `at ${fixed(m.fellAt_s, 2)} s` : 'no') : '–'} | ` +
        `${fixed(m?.loopTime_us.p99, 1)} |`,
    );
  }
  lines.push('', '</details>', '');
  return lines.join('\n');
}

export function writeSummaryMarkdown(file: string, results: ResultsFile): void {
  writeFileAtomicSync(file, renderSummaryMarkdown(results));
}
