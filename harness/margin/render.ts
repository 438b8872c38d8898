// Margin results as text: one terminal line per (scenario × build), and margin.md — critical
// values side by side across builds, every non-monotone boundary with its samples, and the
// family success rates with their intervals.

import { markdownCell } from '../results/writeSummary.js';
import type { ResultsFile, RunResult } from '../results/types.js';
import type { FrictionMarginRecord, MarginSearchRecord, PushMarginRecord } from '../results/margin.js';

function n(x: number, decimals = 3): string {
  return String(Number(x.toFixed(decimals)));
}

/** "× 0.536 (μs 0.268)", "≤ × 0.05", "fails even at × 3", with a mark for a non-monotone boundary. */
export function describeFriction(f: FrictionMarginRecord | null): string {
  if (f === null) return '—';
  const flag = f.monotone ? '' : ' (not monotone)';
  if (f.outcome === 'failsWholeRange') return `fails even at × ${n(f.range[1])}${flag}`;
  if (f.outcome === 'passesWholeRange') return `≤ × ${n(f.criticalScale!)} (μs ${n(f.criticalStaticFriction!)})${flag}`;
  return `× ${n(f.criticalScale!)} (μs ${n(f.criticalStaticFriction!)})${flag}`;
}

export function describePush(p: PushMarginRecord | null): string {
  if (p === null) return '—';
  const flag = p.monotone ? '' : ' (not monotone)';
  if (p.outcome === 'failsWholeRange') return `fails even without the push${flag}`;
  if (p.outcome === 'passesWholeRange') return `≥ × ${n(p.criticalScale!)} (${n(p.criticalPeakForce_N!, 1)} N)${flag}`;
  return `× ${n(p.criticalScale!)} (${n(p.criticalPeakForce_N!, 1)} N)${flag}`;
}

function runsOf(r: RunResult): number {
  const f = r.margin?.friction?.runs ?? 0;
  const p = r.margin?.push?.runs ?? 0;
  // The nominal run is shared by both searches.
  return f + p - (f > 0 && p > 0 ? 1 : 0) || 1;
}

export function renderMarginLines(runs: RunResult[]): string[] {
  return runs.map((r) => {
    const m = r.margin;
    const wall = (m?.friction?.wall_s ?? 0) + (m?.push?.wall_s ?? 0);
    const head = `${r.scenario.id} / ${r.build}: ${r.status} as written`;
    if (!m) return head;
    const notes = m.notes.filter((t) => !t.endsWith('not asked for'));
    return `${head}; critical friction ${describeFriction(m.friction)}; critical push ${describePush(m.push)}; ${runsOf(r)} runs, ${wall.toFixed(1)} s${notes.length ? ` (${notes.join('; ')})` : ''}`;
  });
}

function sampleList(s: MarginSearchRecord): string {
  return s.samples.map((x) => `${n(x.scale, 4)} ${x.status}`).join(', ');
}

export function renderMarginMarkdown(results: ResultsFile, timing?: { wall_s: number; jobs: number }): string {
  const builds = [...new Set(results.runs.map((r) => r.build))];
  const scenarios = [...new Set(results.runs.map((r) => r.scenario.id))];
  const byKey = new Map(results.runs.map((r) => [`${r.scenario.id}\u0000${r.build}`, r]));
  const lines = ['### Footing margin: critical friction and push', ''];
  lines.push(
    'Critical friction: the smallest factor on every material\'s friction at which the scenario still passes (μs of its slipperiest material in brackets). ' +
      'Critical push: the largest factor on every push it survives (peak force in brackets).',
    '',
  );
  lines.push(`| scenario | ${builds.map((b) => `${markdownCell(b)} friction | ${markdownCell(b)} push`).join(' | ')} |`);
  lines.push(`|---|${builds.map(() => '---:|---:').join('|')}|`);
  for (const id of scenarios) {
    const cells = builds.map((b) => {
      const r = byKey.get(`${id}\u0000${b}`);
      return r ? `${markdownCell(describeFriction(r.margin?.friction ?? null))} | ${markdownCell(describePush(r.margin?.push ?? null))}` : ' | ';
    });
    lines.push(`| ${markdownCell(id)} | ${cells.join(' | ')} |`);
  }
  lines.push('');
  const irregular: string[] = [];
  for (const r of results.runs) {
    const searches: [string, MarginSearchRecord | null | undefined][] = [['friction', r.margin?.friction], ['push', r.margin?.push]];
    for (const [what, s] of searches) {
      if (s && !s.monotone) irregular.push(`- \`${r.scenario.id}\` (${markdownCell(r.build)}), ${what}: not monotone — samples ${sampleList(s)}`);
    }
  }
  if (irregular.length > 0) lines.push('**Boundaries that are not one clean threshold** (the critical value is the conservative one)', '', ...irregular, '');
  if (results.families && results.families.length > 0) {
    lines.push('**Families**', '', '| family | build | success | rate | 95 % interval (Wilson) |', '|---|---|---:|---:|---|');
    for (const f of results.families) {
      lines.push(`| ${markdownCell(f.id)} | ${markdownCell(f.build)} | ${f.successes}/${f.runs} | ${f.successRate.toFixed(2)} | [${f.interval.lower.toFixed(2)}, ${f.interval.upper.toFixed(2)}] |`);
    }
    lines.push('');
  }
  if (timing) lines.push(`Wall time ${timing.wall_s.toFixed(1)} s on ${timing.jobs} worker${timing.jobs === 1 ? '' : 's'}.`, '');
  return lines.join('\n');
}
