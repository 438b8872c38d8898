// First divergence between two builds: for each scenario a gate compares, the first time and the
// quantity at which the candidate's trace and the baseline's differ beyond a tolerance. Default
// tolerance 0: the trace files keep fixed decimals (1 µm, 10 µm/s, 0.1 mN — run/results/trace.ts),
// so identical inputs through identical builds give identical rows, and any difference is real
// at that resolution. Needs traces (`footing run --trace`); without them it says so.

import { readFileSync } from 'node:fs';
import path from 'node:path';
import type { ResultsFile, RunResult } from './types.js';

export interface Divergence {
  time_s: number;
  /** Trace column, e.g. foot2_fz_N. */
  column: string;
  /** People's words for the column: "foot 2 normal force". */
  quantity: string;
  baseline: number;
  candidate: number;
}

export interface ScenarioDivergence {
  scenario: string;
  baselineBuild: string;
  candidateBuild: string;
  /** null: no difference over the common rows; undefined with `unavailable`: not computed. */
  divergence?: Divergence | null;
  unavailable?: string;
}

const FOOT_COLUMNS: Record<string, string> = {
  x_m: 'x position', y_m: 'y position', z_m: 'height', vx_mps: 'x velocity (slip)', vy_mps: 'y velocity (slip)',
  fx_N: 'x force', fy_N: 'y force', fz_N: 'normal force', mus: 'friction under it', loaded: 'loaded flag',
};
const TRUNK_COLUMNS: Record<string, string> = {
  base_x_m: 'trunk x', base_y_m: 'trunk y', base_z_m: 'trunk height', base_vx_mps: 'trunk x velocity', base_vy_mps: 'trunk y velocity', base_vz_mps: 'trunk vertical velocity',
};

export function describeColumn(column: string): string {
  if (column in TRUNK_COLUMNS) return TRUNK_COLUMNS[column];
  const foot = /^foot(\d+)_(.+)$/.exec(column);
  if (foot) return `foot ${foot[1]} ${FOOT_COLUMNS[foot[2]] ?? foot[2]}`;
  return column;
}

/** First row and column where two trace texts differ by more than `tolerance` (absolute). */
export function firstDivergence(baselineText: string, candidateText: string, tolerance = 0): Divergence | null {
  const a = baselineText.split('\n');
  const b = candidateText.split('\n');
  const header = a[0].split(',');
  if (b[0] !== a[0]) throw new Error('traces have different columns (different robots?)');
  const rows = Math.min(a.length, b.length);
  for (let r = 1; r < rows; r++) {
    if (a[r] === b[r]) continue;
    const ca = a[r].split(',');
    const cb = b[r].split(',');
    if (ca.length < header.length || cb.length < header.length) continue;
    if (ca[0] !== cb[0]) return { time_s: Number(ca[0]), column: 't_s', quantity: 'time (one run ended)', baseline: Number(ca[0]), candidate: Number(cb[0]) };
    for (let c = 1; c < header.length; c++) {
      const x = Number(ca[c]);
      const y = Number(cb[c]);
      if (Math.abs(x - y) > tolerance) return { time_s: Number(ca[0]), column: header[c], quantity: describeColumn(header[c]), baseline: x, candidate: y };
    }
  }
  return null;
}

/** Divergences for each scenario both result sets ran with the paired builds. */
export function gateDivergences(baseline: { file: string; results: ResultsFile }, candidate: { file: string; results: ResultsFile }, buildPairs: [string, string][], tolerance = 0): ScenarioDivergence[] {
  const out: ScenarioDivergence[] = [];
  const find = (runs: RunResult[], scenario: string, build: string) => runs.find((r) => r.scenario.id === scenario && r.build === build);
  for (const [baseBuild, candBuild] of buildPairs) {
    for (const base of baseline.results.runs.filter((r) => r.build === baseBuild)) {
      const cand = find(candidate.results.runs, base.scenario.id, candBuild);
      if (!cand || cand.scenario.hash !== base.scenario.hash) continue;
      const entry: ScenarioDivergence = { scenario: base.scenario.id, baselineBuild: baseBuild, candidateBuild: candBuild };
      if (!base.trace || !cand.trace) {
        out.push({ ...entry, unavailable: 'no traces (run with --trace)' });
        continue;
      }
      try {
        const a = readFileSync(path.join(path.dirname(baseline.file), base.trace), 'utf8');
        const b = readFileSync(path.join(path.dirname(candidate.file), cand.trace), 'utf8');
        out.push({ ...entry, divergence: firstDivergence(a, b, tolerance) });
      } catch (e) {
        out.push({ ...entry, unavailable: `traces unreadable (${(e as Error).message})` });
      }
    }
  }
  return out;
}

const show = (x: number) => (Math.abs(x) >= 100 ? x.toFixed(1) : Math.abs(x) >= 1 ? x.toFixed(2) : x.toPrecision(3));

export function describeDivergence(d: ScenarioDivergence): string {
  if (d.unavailable) return `not computed: ${d.unavailable}`;
  if (!d.divergence) return 'none (traces identical)';
  const v = d.divergence;
  const unit = /_N$/.test(v.column) ? ' N' : /_mps$/.test(v.column) ? ' m/s' : /_m$/.test(v.column) ? ' m' : '';
  return `first differs at ${v.time_s.toFixed(3)} s: ${v.quantity}, ${show(v.candidate - v.baseline)}${unit} (baseline ${show(v.baseline)}, candidate ${show(v.candidate)})`;
}

/** The gate.md section (empty when there is nothing to say). */
export function renderDivergenceMarkdown(list: ScenarioDivergence[]): string {
  if (list.length === 0) return '';
  const lines = ['', '**First divergence** (candidate vs baseline traces; tolerance 0 at trace resolution)', ''];
  for (const d of list) lines.push(`- \`${d.scenario}\` (\`${d.baselineBuild}\` → \`${d.candidateBuild}\`): ${describeDivergence(d)}`);
  return lines.join('\n') + '\n';
}
