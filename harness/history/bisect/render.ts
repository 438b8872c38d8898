// bisect.md: the answer first, then every tested commit with its verdict and headline metrics.

import type { BisectRecord } from './types.js';

const short = (commit: string) => commit.slice(0, 12);
const cell = (text: string) => text.replace(/\|/g, '\\|').replace(/\n/g, ' ');

export function renderBisectMarkdown(record: BisectRecord): string {
  const lines = [`# Bisect: ${short(record.good.commit)} (good) … ${short(record.bad.commit)} (bad)`, ''];
  if (record.outcome === 'found' && record.firstBad) {
    lines.push(`**First bad commit: \`${short(record.firstBad.commit)}\` ${cell(record.firstBad.subject)}** (commit ${record.firstBad.index} of ${record.rangeSize} after the good one).`, '');
    for (const reason of record.firstBad.reasons.slice(0, 10)) lines.push(`- ${cell(reason)}`);
  } else if (record.outcome === 'ambiguous') {
    lines.push('**Ambiguous:** skipped commits leave the first bad commit among:', '');
    for (const c of record.candidates) lines.push(`- \`${short(c.commit)}\` ${cell(c.subject)}`);
  } else {
    lines.push(`**Not found:** ${cell(record.notFoundReason ?? '')}`);
  }
  lines.push('', `Judged by: ${cell(record.judge)} · scenarios: ${record.scenarios.join(', ')} · builds: ${record.builds} (bound without skips: ${record.buildBound})`, '');
  if (record.skipped.length > 0) {
    lines.push('Skipped (did not build):', '');
    for (const s of record.skipped) lines.push(`- \`${short(s.commit)}\` ${cell(s.subject)}: ${cell(s.message)}`);
    lines.push('');
  }
  lines.push('| # | commit | subject | verdict | stance friction margin min (per scenario) | why |', '| --- | --- | --- | --- | --- | --- |');
  for (const t of record.tested) {
    const margins = t.runs.map((r) => `${r.scenario} ${r.metrics['stanceMargin.min'] === null ? 'n/a' : (r.metrics['stanceMargin.min'] as number).toFixed(3)}`).join(', ');
    lines.push(`| ${t.index} | \`${short(t.commit)}\` | ${cell(t.subject)} | ${t.verdict} | ${cell(margins)} | ${cell(t.reasons.slice(0, 2).join('; '))} |`);
  }
  lines.push('', 'Simulation is not proof of safety: the commit named here lost margin in simulation; hardware trials still follow your lab\'s risk assessment.', '');
  return lines.join('\n');
}
