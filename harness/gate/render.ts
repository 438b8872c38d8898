// The gate's outcome as Markdown (gate.md, for a merge-request comment) and as a plain text table
// for the terminal. Both list broken rules first, then every other metric that moved.

import { markdownCell } from '../results/writeSummary.js';
import type { GateOutcome, GateRow, GateValue } from './types.js';

const DECIMALS: Record<string, number> = {
  'frictionMargin.min': 3,
  'frictionMargin.p05': 3,
  slipDistance_m: 4,
  'loopTime_us.p99': 1,
  trackingRms_m: 4,
  progress: 3,
  'margin.criticalFrictionScale': 3,
  'margin.criticalPushScale': 3,
  'family.successRate': 2,
};

export function formatGateValue(metric: string, value: GateValue): string {
  if (value === null) return 'n/a';
  if (metric === 'fell') return typeof value === 'number' ? `at ${value.toFixed(2)} s` : value ? 'yes' : 'no';
  if (typeof value === 'number') return metric in DECIMALS ? value.toFixed(DECIMALS[metric]) : String(value);
  return String(value);
}

function builds(row: GateRow): string {
  return row.baselineBuild === row.candidateBuild ? row.baselineBuild : `${row.baselineBuild} → ${row.candidateBuild}`;
}

function headline(outcome: GateOutcome): string {
  const broken = outcome.rows.filter((r) => r.broken).length;
  const runs = `${outcome.compared} compared run${outcome.compared === 1 ? '' : 's'}`;
  return outcome.verdict === 'block'
    ? `block — ${broken} rule${broken === 1 ? '' : 's'} broken in ${runs}`
    : `hold — no rule broken in ${runs}`;
}

function markdownTable(rows: GateRow[]): string[] {
  const lines = ['| scenario | builds | metric | baseline | candidate | change | rule |', '|---|---|---|---:|---:|---:|---|'];
  for (const r of rows) {
    lines.push(
      `| ${markdownCell(r.scenario)} | ${markdownCell(builds(r))} | ${r.metric} | ${formatGateValue(r.metric, r.baseline)} | ` +
        `${formatGateValue(r.metric, r.candidate)} | ${markdownCell(r.change)} | ${r.rule === null ? '(info)' : markdownCell(r.rule)}${r.broken ? ' ❌' : ''} |`,
    );
  }
  return lines;
}

export function renderGateMarkdown(outcome: GateOutcome): string {
  const broken = outcome.rows.filter((r) => r.broken);
  const moved = outcome.rows.filter((r) => !r.broken);
  const lines = [`### Footing gate: ${outcome.verdict === 'block' ? '❌' : '✅'} ${headline(outcome)}`, ''];
  if (outcome.buildPairs.length > 0) {
    lines.push(`Builds compared (baseline → candidate): ${outcome.buildPairs.map(([b, c]) => `\`${b}\` → \`${c}\``).join(', ')}`, '');
  }
  if (broken.length > 0) {
    lines.push('**Broken rules**', '');
    for (const r of broken) lines.push(`- \`${r.scenario}\` (${markdownCell(builds(r))}): ${r.reason ?? r.metric}`);
    lines.push('', ...markdownTable(broken), '');
  }
  if (moved.length > 0) {
    lines.push(`<details><summary>${moved.length} other metric${moved.length === 1 ? '' : 's'} moved within policy</summary>`, '', ...markdownTable(moved), '', '</details>', '');
  }
  if (outcome.notComparable.length > 0) {
    lines.push('**Not comparable** (not compared, see why)', '');
    for (const n of outcome.notComparable) lines.push(`- \`${n.scenario}\` (${markdownCell(n.baselineBuild)} → ${markdownCell(n.candidateBuild)}): ${markdownCell(n.reason)}`);
    lines.push('');
  }
  if (outcome.unpaired.length > 0) {
    lines.push('**Unpaired**', '');
    for (const u of outcome.unpaired) lines.push(`- ${u.side} \`${u.build}\`${u.scenario === null ? '' : ` \`${u.scenario}\``}: ${markdownCell(u.reason)}`);
    lines.push('');
  }
  for (const w of outcome.warnings) lines.push(`> ${w}`, '');
  return lines.join('\n');
}

function textTable(rows: GateRow[]): string[] {
  const header = ['', 'scenario', 'builds', 'metric', 'baseline', 'candidate', 'change', 'rule'];
  const body = rows.map((r) => [
    r.broken ? 'BROKEN' : '',
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
  const lines = [`gate: ${headline(outcome)}`];
  for (const r of outcome.rows.filter((row) => row.broken)) lines.push(`  broken: ${r.scenario} (${builds(r)}): ${r.reason ?? r.metric}`);
  if (outcome.rows.length > 0) lines.push('', ...textTable(outcome.rows));
  for (const n of outcome.notComparable) lines.push(`not comparable: ${n.scenario} (${n.baselineBuild} → ${n.candidateBuild}): ${n.reason}`);
  for (const u of outcome.unpaired) lines.push(`unpaired: ${u.side} ${u.build}${u.scenario === null ? '' : ` ${u.scenario}`}: ${u.reason}`);
  for (const w of outcome.warnings) lines.push(`warning: ${w}`);
  return lines.join('\n');
}
