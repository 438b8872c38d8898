// summary.md: a short Markdown digest for a merge-request comment — totals per build, the failing
// runs with their reasons, and the full table folded away.

import { writeFileAtomicSync } from '../files/atomic.js';
import { formatFixed } from '../score/format.js';
import { markdownCode, markdownInline } from '../files/markdown.js';
import { aheadBuilds, aheadTable, stanceMarginMin, verdictOf, type AheadAllowances, type AheadTable } from './ahead.js';
import { runsByBuild } from './buildOrder.js';
import { SLIPPERY_STATIC_FRICTION } from './slippery.js';
import type { ResultsFile, RunResult } from './types.js';

export interface SummaryOptions {
  /** The gate's baseline build of the run (`footing run --baseline`): the leader of the ahead table. */
  baseline?: string;
  /** What counts as a difference in the ahead table (the run's gate policy; default the gate's). */
  allowances?: AheadAllowances;
}

/** Failures listed in full before "… and N more" (keeps the comment short). */
export const SUMMARY_FAILURE_LIMIT = 20;

/** Build-supplied text in a table cell or list item: one inert line (harness/text/markdown.ts). */
export const markdownCell = markdownInline;

function fixed(value: number | null | undefined, decimals: number): string {
  // formatFixed: a margin of −2e−16 (a foot exactly on the cone, rounding) reads 0.000, not -0.000.
  return value === null || value === undefined ? '–' : formatFixed(value, decimals);
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

function aheadCountLine(table: AheadTable, name: (build: string) => string): string {
  const ahead = table.rows.filter((row) => row.judgement.ahead).length;
  return `${name(table.leaderBuild)} ahead of ${name(table.otherBuild)} on ${ahead} of ${table.rows.length} slippery scenarios`;
}

/** The count line alone, for the terminal (plain text); null when there is no table to count. */
export function aheadSummaryLine(results: ResultsFile, options: SummaryOptions = {}): string | null {
  const builds = aheadBuilds(results, options.baseline);
  if ('missing' in builds) return null;
  return aheadCountLine(aheadTable(results, builds.leader, builds.other, options.allowances), (build) => build);
}

/**
 * The ahead table (docs/scoring.md, Ahead): per slippery scenario the two builds' verdicts, stance
 * margins and slips, the judgement, and the count. Computed from the runs, never written by hand.
 */
export function renderAheadMarkdown(results: ResultsFile, options: SummaryOptions = {}): string[] {
  const title = `**Ahead on slippery scenarios** (lowest μs ≤ ${SLIPPERY_STATIC_FRICTION}, docs/scoring.md)`;
  const builds = aheadBuilds(results, options.baseline);
  if ('missing' in builds) return [title, '', `No ahead table: ${markdownInline(builds.missing)}.`];
  const table = aheadTable(results, builds.leader, builds.other, options.allowances);
  const a = markdownCell(table.leaderBuild);
  const b = markdownCell(table.otherBuild);
  const lines = [title, ''];
  if (table.rows.length > 0) {
    lines.push(
      `| scenario | lowest μs | ${a} | ${b} | ${a} margin min | ${b} margin min | ${a} slip (m) | ${b} slip (m) | ${a} vs ${b} |`,
      '|---|---:|---|---|---:|---:|---:|---:|---|',
    );
    for (const row of table.rows) {
      lines.push(
        `| ${markdownCell(row.scenario)} | ${fixed(row.lowestStaticFriction, 2)} | ${verdictOf(row.leader)} | ${verdictOf(row.other)} | ` +
          `${fixed(stanceMarginMin(row.leader), 3)} | ${fixed(stanceMarginMin(row.other), 3)} | ` +
          `${fixed(row.leader.metrics?.slipDistance_m, 4)} | ${fixed(row.other.metrics?.slipDistance_m, 4)} | ` +
          `${row.judgement.ahead ? 'ahead' : 'not ahead'} (${row.judgement.reason}) |`,
      );
    }
    lines.push('');
  }
  lines.push(aheadCountLine(table, markdownCell));
  if (table.unpaired.length > 0) {
    lines.push('', `Not compared (run by one of the two builds only): ${table.unpaired.map(markdownCode).join(', ')}`);
  }
  const unknown = results.runs.filter((r) => (r.build === table.leaderBuild || r.build === table.otherBuild) && r.scenario.lowestStaticFriction === undefined);
  if (unknown.length > 0) {
    lines.push('', `Not judged: ${unknown.length} run${unknown.length === 1 ? '' : 's'} without \`lowestStaticFriction\` (written before it was recorded).`);
  }
  return lines;
}

export function renderSummaryMarkdown(results: ResultsFile, options: SummaryOptions = {}): string {
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
  lines.push('', ...renderAheadMarkdown(results, options));
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

export function writeSummaryMarkdown(file: string, results: ResultsFile, options: SummaryOptions = {}): void {
  writeFileAtomicSync(file, renderSummaryMarkdown(results, options));
}
