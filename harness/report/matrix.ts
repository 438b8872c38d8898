// The comparison matrix's cells: each run's key metrics, and for non-baseline builds the change
// against the baseline build's run of the same scenario, judged better / worse / about the same.
// The judgement here is for reading only; whether a change breaks the merge policy is the gate's
// answer (GateRow.broken), shown beside it, never recomputed here.

import { formatGateValue } from '../gate/render.js';
import type { GateOutcome } from '../gate/types.js';
import type { RunResult } from '../results/types.js';
import type { ScoreMetrics } from '../score/types.js';
import { label } from './plot/svg.js';

export type Mark = 'better' | 'worse' | 'same';

export interface MetricDefinition {
  /** Metric path as the gate names it (GateRow.metric). */
  key: string;
  label: string;
  value(m: ScoreMetrics): number | null;
  /** Which way is better. */
  better: 'higher' | 'lower';
  /**
   * Changes within this band read as "about the same". Margins: 0.005, a quarter of the gate's
   * default allowance; slip: 2 mm or 5 %, below any slip a person would notice on a floor; loop
   * time: 10 %, the quiet-machine spread (common practice). Counts: any change.
   */
  same(base: number, cand: number): boolean;
  format(value: number | null, m: ScoreMetrics): string;
}

const absBand = (band: number) => (a: number, b: number) => Math.abs(b - a) <= band;

export const MATRIX_METRICS: MetricDefinition[] = [
  {
    key: 'frictionMargin.min',
    label: 'margin min',
    value: (m) => m.frictionMargin.min,
    better: 'higher',
    same: absBand(0.005),
    format: (v) => (v === null ? 'n/a' : label(v, 3)),
  },
  {
    key: 'frictionMargin.p05',
    label: 'margin p05',
    value: (m) => m.frictionMargin.p05,
    better: 'higher',
    same: absBand(0.005),
    format: (v) => (v === null ? 'n/a' : label(v, 3)),
  },
  {
    key: 'stanceMargin.min',
    label: 'stance margin min',
    value: (m) => m.stanceMargin?.min ?? null,
    better: 'higher',
    same: absBand(0.005),
    format: (v) => (v === null ? 'n/a' : label(v, 3)),
  },
  {
    key: 'stanceMargin.p05',
    label: 'stance margin p05',
    value: (m) => m.stanceMargin?.p05 ?? null,
    better: 'higher',
    same: absBand(0.005),
    format: (v) => (v === null ? 'n/a' : label(v, 3)),
  },
  {
    key: 'touchdown.slip_m.mean',
    label: 'slip per touchdown',
    value: (m) => m.touchdown?.slip_m.mean ?? null,
    better: 'lower',
    same: (a, b) => Math.abs(b - a) <= Math.max(0.00005, 0.05 * Math.abs(a)),
    format: (v) => (v === null ? 'n/a' : `${label(v * 1000, 3)} mm`),
  },
  {
    key: 'slipDistance_m',
    label: 'slip',
    value: (m) => m.slipDistance_m,
    better: 'lower',
    same: (a, b) => Math.abs(b - a) <= Math.max(0.002, 0.05 * Math.abs(a)),
    format: (v) => (v === null ? 'n/a' : v < 0.1 ? `${label(v * 1000, 1)} mm` : `${label(v, 3)} m`),
  },
  {
    key: 'violations.commanded',
    label: 'commanded viol.',
    value: (m) => m.violations.commanded,
    better: 'lower',
    same: (a, b) => a === b,
    format: (v) => (v === null ? 'n/a' : String(v)),
  },
  {
    key: 'fell',
    label: 'fell',
    value: (m) => (m.fell ? 1 : 0),
    better: 'lower',
    same: (a, b) => a === b,
    format: (_v, m) => formatGateValue('fell', m.fell ? m.fellAt_s : false),
  },
  {
    key: 'loopTime_us.p99',
    label: 'loop p99',
    value: (m) => m.loopTime_us.p99,
    better: 'lower',
    same: (a, b) => Math.abs(b - a) <= 0.1 * Math.abs(a),
    format: (v, m) => (v === null ? 'n/a' : `${label(v, v < 10 ? 1 : 0)} µs / ${label(m.loopTime_us.budget, 0)}`),
  },
];

export interface MetricCell {
  label: string;
  value: string;
  /** Signed change against the baseline, e.g. "−0.031"; null on the baseline itself or n/a. */
  delta: string | null;
  mark: Mark | null;
  /** The glyph that carries the mark without colour: ▲ better, ▼ worse, = same. */
  glyph: string;
  /** Words for the mark (screen readers, tooltips): "better than baseline" etc. */
  markText: string;
  /** Show the delta beside the glyph (not when about the same). */
  showDelta: boolean;
  /** The gate broke a rule on this metric for this run. */
  broken: boolean;
  /** Extra flag, e.g. loop time over budget. */
  note: string | null;
}

export const MARK_GLYPHS: Record<Mark, string> = { better: '▲', worse: '▼', same: '=' };

export function metricCells(run: RunResult, baseline: RunResult | null, gate: GateOutcome | null): MetricCell[] {
  const m = run.metrics;
  if (!m) return [];
  const base = baseline && baseline !== run && baseline.scenario.hash === run.scenario.hash ? baseline.metrics : null;
  return [...MATRIX_METRICS.map((def) => {
    const value = def.value(m);
    let delta: string | null = null;
    let mark: Mark | null = null;
    if (base) {
      const b = def.value(base);
      if (b !== null && value !== null) {
        mark = def.same(b, value) ? 'same' : (value > b) === (def.better === 'higher') ? 'better' : 'worse';
        delta = def.key === 'fell' ? (b === value ? null : value > b ? 'new fall' : 'no longer falls') : signed(value - b, def);
      }
    }
    const broken =
      gate?.rows.some((r) => r.broken && r.metric === def.key && r.scenario === run.scenario.id && r.candidateBuild === run.build) ?? false;
    const over = def.key === 'loopTime_us.p99' && value !== null && value > m.loopTime_us.budget;
    return {
      label: def.label,
      value: def.format(value, m),
      delta,
      mark,
      glyph: mark ? MARK_GLYPHS[mark] : '',
      markText: mark === 'same' ? 'about the same as baseline' : mark ? `${mark} than baseline` : '',
      showDelta: mark !== null && mark !== 'same' && delta !== null,
      broken,
      note: over ? 'over budget' : null,
    };
  }), ...optionalCells(m, base)];
}

/**
 * Metric groups the scorer may add (stance and touchdown metrics): shown where a run carries them,
 * one cell per numeric field (one level of nesting, e.g. `touchdown.impactSpeed_mps.max`), with
 * the change against the baseline but no better/worse judgement until the metric has its own
 * MATRIX_METRICS entry (which way is better is the metric's fact, not the report's guess).
 */
export const OPTIONAL_METRIC_GROUPS = ['stance', 'touchdown'] as const;

function optionalCells(m: ScoreMetrics, base: ScoreMetrics | null): MetricCell[] {
  const out: MetricCell[] = [];
  const numbers = (value: unknown, prefix: string, into: Map<string, number>) => {
    if (typeof value === 'number' && Number.isFinite(value)) into.set(prefix, value);
    else if (typeof value === 'object' && value !== null && !Array.isArray(value) && prefix.split('.').length < 3)
      for (const [k, v] of Object.entries(value)) numbers(v, `${prefix}.${k}`, into);
  };
  for (const group of OPTIONAL_METRIC_GROUPS) {
    const mine = new Map<string, number>();
    const theirs = new Map<string, number>();
    numbers((m as unknown as Record<string, unknown>)[group], group, mine);
    if (base) numbers((base as unknown as Record<string, unknown>)[group], group, theirs);
    for (const [key, value] of mine) {
      // Rows of their own (MATRIX_METRICS) are not repeated; of a spread only the mean is shown,
      // the full spread is in results.json.
      if (MATRIX_METRICS.some((def) => def.key === key) || (/\.(p95|max)$/.test(key) && mine.has(key.replace(/\.(p95|max)$/, '.mean')))) continue;
      if (key === `${group}.transient_s`) continue;
      const b = theirs.get(key);
      const change = b === undefined ? null : value - b;
      out.push({
        label: key.replace(/\./g, ' '),
        value: change === null || change === 0 ? label(value, 3) : `${label(value, 3)} (${change > 0 ? '+' : '−'}${label(Math.abs(change), 3)})`,
        delta: null,
        mark: null,
        glyph: '',
        markText: '',
        showDelta: false,
        broken: false,
        note: null,
      });
    }
  }
  return out;
}

function signed(change: number, def: MetricDefinition): string {
  const digits = def.key.startsWith('frictionMargin') || def.key.startsWith('stanceMargin') ? 3 : def.key === 'slipDistance_m' ? 4 : def.key === 'loopTime_us.p99' ? 1 : 0;
  if (def.key === 'touchdown.slip_m.mean') {
    const mm = change * 1000;
    return `${mm >= 0 ? '+' : '−'}${label(Math.abs(mm), 3)} mm`;
  }
  if (def.key === 'slipDistance_m') {
    const mm = change * 1000;
    return `${mm >= 0 ? '+' : '−'}${label(Math.abs(mm), 1)} mm`;
  }
  const text = label(Math.abs(change), digits);
  return `${change >= 0 ? '+' : '−'}${text}${def.key === 'loopTime_us.p99' ? ' µs' : ''}`;
}
