// The gate's outcome as Markdown (gate.md, for a merge-request comment) and as a plain text table
// for the terminal. Both list broken rules first, then every other metric that moved.

import { markdownCode } from '../files/markdown.js';
import { formatFixed } from '../score/format.js';
import { markdownCell } from '../results/writeSummary.js';
import type { GateOutcome, GateRow, GateValue } from './types.js';

const DECIMALS: Record<string, number> = {
  'frictionMargin.min': 3,
  'frictionMargin.p05': 3,
  'stanceMargin.min': 3,
  'stanceMargin.p05': 3,
  slipDistance_m: 4,
  'touchdown.slip_m.mean': 6,
  'loopTime_us.p99': 1,
  'loopTime.ratio': 1,
  'loopTime.budgetRatio': 2,
  trackingRms_m: 4,
  progress: 3,
  'margin.criticalFrictionScale': 3,
  'margin.criticalPushScale': 3,
  'family.successRate': 2,
};

export function formatGateValue(metric: string, value: GateValue): string {
  if (value === null) return 'n/a';
  if (metric === 'fell') return typeof value === 'number' ? `at ${value.toFixed(2)} s` : value ? 'yes' : 'no';
  if (typeof value === 'number') return metric in DECIMALS ? formatFixed(value, DECIMALS[metric]) : String(value);
  return String(value);
}

function builds(row: GateRow): string {
  return row.baselineBuild === row.candidateBuild ? row.baselineBuild : `${row.baselineBuild} → ${row.candidateBuild}`;
}

/** gate.md stays below this (review comments on common code forges are cut at 65,536 characters). */
export const GATE_MARKDOWN_LIMIT_chars = 60_000;

function plural(n: number, word: string): string {
  return `${n} ${word}${n === 1 ? '' : 's'}`;
}

/** The verdict in one line, naming the first blocking rule, its scenario and builds. */
export function verdictLine(outcome: GateOutcome): string {
  const blocking = outcome.rows.filter((r) => r.blocking);
  const runs = plural(outcome.compared, 'compared run');
  if (outcome.verdict === 'block') {
    const first = blocking[0];
    const more = blocking.length > 1 ? ` (and ${blocking.length - 1} more blocking)` : '';
    return `block — ${first.scenario} (${builds(first)}): ${first.reason ?? first.metric}${more}`;
  }
  const inherited = outcome.rows.filter((r) => r.broken && !r.blocking).length;
  return `hold — nothing the candidate changed breaks a rule in ${runs}` + (inherited > 0 ? `; ${plural(inherited, 'inherited break')} listed` : '');
}

function runChangeLine(outcome: GateOutcome): string {
  const c = outcome.runChanges;
  return `Runs: ${plural(c['new-failure'], 'new failure')}, ${c['still-failing']} still failing, ${c.fixed} fixed, ${c.passing} passing.`;
}

function markdownTable(rows: GateRow[], withScenario = false): string[] {
  const lines = withScenario
    ? ['| scenario | builds | metric | baseline | candidate | change | rule |', '|---|---|---|---:|---:|---:|---|']
    : ['| builds | metric | baseline | candidate | change | rule |', '|---|---|---:|---:|---:|---|'];
  for (const r of rows) {
    lines.push(
      `| ${withScenario ? `${markdownCell(r.scenario)} | ` : ''}${markdownCell(builds(r))} | ${markdownCell(r.metric)} | ${markdownCell(formatGateValue(r.metric, r.baseline))} | ` +
        `${markdownCell(formatGateValue(r.metric, r.candidate))} | ${markdownCell(r.change)} | ${r.rule === null ? '(info)' : markdownCell(r.rule)}${r.blocking ? ' ❌' : r.broken ? ' ⚠️' : ''} |`,
    );
  }
  return lines;
}

function byScenario(rows: GateRow[]): Map<string, GateRow[]> {
  const groups = new Map<string, GateRow[]>();
  for (const r of rows) {
    const list = groups.get(r.scenario);
    if (list) list.push(r);
    else groups.set(r.scenario, [r]);
  }
  return groups;
}

function reasonList(rows: GateRow[]): string[] {
  const lines: string[] = [];
  for (const [scenario, list] of byScenario(rows)) {
    lines.push(`- ${markdownCode(scenario)}`);
    for (const r of list) lines.push(`  - ${markdownCell(builds(r))}: ${markdownCell(r.reason ?? r.metric)}`);
  }
  return lines;
}

/**
 * gate.md: verdict, run changes, blocking breaks and inherited ones by scenario, then every other
 * moved metric in a collapsed section grouped by scenario. A section that would push the comment
 * past GATE_MARKDOWN_LIMIT_chars is cut with a pointer to the full report.
 */
export function renderGateMarkdown(outcome: GateOutcome, fullReport = 'report.html'): string {
  const blocking = outcome.rows.filter((r) => r.blocking);
  const inherited = outcome.rows.filter((r) => r.broken && !r.blocking);
  const moved = outcome.rows.filter((r) => !r.broken);
  const head = [`### Footing gate: ${outcome.verdict === 'block' ? '❌' : '✅'} ${markdownCell(verdictLine(outcome))}`, '', runChangeLine(outcome), ''];
  if (outcome.buildPairs.length > 0) {
    head.push(`Builds compared (baseline → candidate): ${outcome.buildPairs.map(([b, c]) => `${markdownCode(b)} → ${markdownCode(c)}`).join(', ')}`, '');
  }
  const sections: string[][] = [];
  if (blocking.length > 0) sections.push([`**Blocking** (${blocking.length})`, '', ...reasonList(blocking), '', ...markdownTable(blocking, true), '']);
  if (inherited.length > 0) {
    sections.push([`**Still broken on the baseline too** (${inherited.length}; not blocking — set \`blockStillFailing: true\` to block)`, '', ...reasonList(inherited), '']);
  }
  if (moved.length > 0) {
    const body = [`<details><summary>${plural(moved.length, 'other metric')} moved within policy</summary>`, ''];
    for (const [scenario, list] of byScenario(moved)) body.push(`**${markdownCode(scenario)}**`, '', ...markdownTable(list), '');
    body.push('</details>', '');
    sections.push(body);
  }
  if (outcome.notComparable.length > 0) {
    const body = ['**Not comparable** (not compared, see why)', ''];
    for (const n of outcome.notComparable) body.push(`- ${markdownCode(n.scenario)} (${markdownCell(n.baselineBuild)} → ${markdownCell(n.candidateBuild)}): ${markdownCell(n.reason)}`);
    sections.push([...body, '']);
  }
  const otherUnpaired = outcome.unpaired.filter((u) => !(u.side === 'baseline' && u.scenario !== null));
  if (otherUnpaired.length > 0) {
    const body = ['**Unpaired**', ''];
    for (const u of otherUnpaired) body.push(`- ${u.side} ${markdownCode(u.build)}${u.scenario === null ? '' : ` ${markdownCode(u.scenario)}`}: ${markdownCell(u.reason)}`);
    sections.push([...body, '']);
  }
  if (outcome.warnings.length > 0) sections.push(outcome.warnings.flatMap((w) => [`> ${markdownCell(w)}`, '']));

  const cut = `_… cut to stay under ${GATE_MARKDOWN_LIMIT_chars.toLocaleString('en')} characters: the full comparison is in ${fullReport}._`;
  const lines = [...head];
  let length = lines.join('\n').length;
  for (const section of sections) {
    const text = section.join('\n');
    if (length + text.length + cut.length + 2 > GATE_MARKDOWN_LIMIT_chars) {
      // Keep the lines of the section that fit, then say where the rest is.
      for (const line of section) {
        if (length + line.length + cut.length + 16 > GATE_MARKDOWN_LIMIT_chars) break;
        lines.push(line);
        length += line.length + 1;
      }
      if (section[0].startsWith('<details>') && lines[lines.length - 1] !== '</details>') lines.push('</details>');
      lines.push('', cut, '');
      return lines.join('\n');
    }
    lines.push(...section);
    length += text.length + 1;
  }
  return lines.join('\n');
}

function textTable(rows: GateRow[]): string[] {
  const header = ['', 'scenario', 'builds', 'metric', 'baseline', 'candidate', 'change', 'rule'];
  const body = rows.map((r) => [
    r.blocking ? 'BLOCKS' : r.broken ? 'inherited' : '',
    r.scenario,
    builds(r),
    r.metric,
    formatGateValue(r.metric, r.baseline),
    formatGateValue(r.metric, r.candidate),
    r.change,
    r.rule ?? '(info)',
  ]);
  const widths = header.map((h, k) => Math.max(h.length, ...body.map((cells) => cells[k].length)));
  const line = (cells: string[]) => cells.map((c, k) => c.padEnd(widths[k])).join('  ').trimEnd();
  return [line(header), ...body.map(line)];
}

export function renderGateText(outcome: GateOutcome): string {
  const lines = [`gate: ${verdictLine(outcome)}`, `  ${runChangeLine(outcome)}`];
  for (const r of outcome.rows.filter((row) => row.blocking)) lines.push(`  blocking: ${r.scenario} (${builds(r)}): ${r.reason ?? r.metric}`);
  for (const r of outcome.rows.filter((row) => row.broken && !row.blocking)) lines.push(`  still broken (inherited): ${r.scenario} (${builds(r)}): ${r.reason ?? r.metric}`);
  if (outcome.rows.length > 0) lines.push('', ...textTable(outcome.rows));
  for (const n of outcome.notComparable) lines.push(`not comparable: ${n.scenario} (${n.baselineBuild} → ${n.candidateBuild}): ${n.reason}`);
  for (const u of outcome.unpaired) {
    if (u.side === 'baseline' && u.scenario !== null) continue; // its coverage row says it
    lines.push(`unpaired: ${u.side} ${u.build}${u.scenario === null ? '' : ` ${u.scenario}`}: ${u.reason}`);
  }
  for (const w of outcome.warnings) lines.push(`warning: ${w}`);
  return lines.join('\n');
}
