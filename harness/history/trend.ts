// The trend page's data: for each (scenario × build) and each trend metric (metrics.ts), the
// nights' values, the gate's line against the window's first night (limits.ts), and the change
// points Pettitt's test finds (changePoint.ts) with the nights and commits either side. Change
// points are looked for within one scenario revision at a time: across a revision the numbers
// measure something else.

import type { GatePolicy } from '../gate/defaults.js';
import { rulesFor } from '../gate/defaults.js';
import { buildStyle } from '../report/plot/palette.js';
import type { SvgMarkup } from '../report/plot/svg.js';
import { DEFAULT_ALPHA, detectChangePoints, type ChangePoint, type ChangePointOptions } from './changePoint.js';
import { gateLimit, type GateLimit } from './limits.js';
import { TREND_METRICS } from './metrics.js';
import { nightDate, shortCommit, trendPlot } from './trendPlot.js';
import type { HistoryStore, NightSummary, TrendPoint } from './types.js';

export interface TrendOptions {
  policy: GatePolicy;
  /** Only these scenario ids / builds / metrics (default: all). */
  scenarios?: string[];
  builds?: string[];
  metrics?: string[];
  /** Only the last N nights of each line. */
  last?: number;
  changePoints?: ChangePointOptions;
}

export interface NightSide {
  date: string;
  startedAt: string;
  commit: string;
  value: string;
}

export interface TrendChange {
  before: NightSide;
  after: NightSide;
  p: string;
  shift: string;
  /** 'worse' when the shift goes against the metric's good direction. */
  direction: 'worse' | 'better';
}

export interface TrendLine {
  build: string;
  metric: string;
  label: string;
  nights: number;
  latest: string;
  limit: string | null;
  changes: TrendChange[];
  /** Raw change points (indices into points), for tests and bisect hand-off. */
  changePoints: ChangePoint[];
  points: TrendPoint[];
  svg: SvgMarkup;
}

export interface TrendScenario {
  id: string;
  anchor: string;
  lines: TrendLine[];
  changeCount: number;
}

export interface TrendModel {
  title: string;
  generatedAt: string;
  nights: NightSummary[];
  firstNight: string | null;
  lastNight: string | null;
  alpha: number;
  scenarios: TrendScenario[];
  changeCount: number;
}

const fixed = (value: number | null, decimals: number): string => (value === null ? 'n/a' : value.toFixed(decimals));

/** Change points of a line, found segment by segment (one scenario hash each), skipping unmeasured nights. */
export function lineChangePoints(points: readonly TrendPoint[], options: ChangePointOptions = {}): ChangePoint[] {
  const found: ChangePoint[] = [];
  let start = 0;
  for (let k = 1; k <= points.length; k++) {
    if (k < points.length && points[k].scenarioHash === points[start].scenarioHash) continue;
    const index: number[] = [];
    for (let j = start; j < k; j++) if (points[j].value !== null) index.push(j);
    for (const change of detectChangePoints(index.map((j) => points[j].value as number), options)) {
      found.push({ ...change, before: index[change.before], after: index[change.after] });
    }
    start = k;
  }
  return found;
}

export function buildTrendModel(store: HistoryStore, options: TrendOptions): TrendModel {
  const metrics = TREND_METRICS.filter((m) => options.metrics === undefined || options.metrics.includes(m.metric));
  const series = store.series().filter((s) => (options.scenarios === undefined || options.scenarios.includes(s.scenario)) && (options.builds === undefined || options.builds.includes(s.build)));
  const scenarios = new Map<string, TrendScenario>();
  for (const { scenario, build } of series) {
    const rules = rulesFor(options.policy, scenario);
    for (const m of metrics) {
      let points = store.trend({ scenario, build, metric: m.metric });
      if (options.last !== undefined) points = points.slice(-options.last);
      if (points.every((p) => p.value === null)) continue;
      const changePoints = lineChangePoints(points, options.changePoints);
      const first = points.find((p) => p.value !== null) as TrendPoint;
      const limit: GateLimit | null = gateLimit(m.metric, first.value as number, rules);
      const side = (k: number): NightSide => ({ date: nightDate(points[k].startedAt), startedAt: points[k].startedAt, commit: shortCommit(points[k].commit), value: fixed(points[k].value, m.decimals + 2) });
      const line: TrendLine = {
        build,
        metric: m.metric,
        label: m.label,
        nights: points.length,
        latest: fixed(points[points.length - 1].value, m.decimals + 2),
        limit: limit ? `${limit.rule} → ${limit.breaks === 'below' ? '≥' : '≤'} ${limit.value.toFixed(m.decimals + 2)}` : null,
        changePoints,
        changes: changePoints.map((c) => ({
          before: side(c.before),
          after: side(c.after),
          p: c.p.toExponential(2),
          shift: `${c.shift >= 0 ? '+' : '−'}${Math.abs(c.shift).toFixed(m.decimals + 2)}`,
          direction: (c.shift < 0) === m.higherIsBetter ? 'worse' : 'better',
        })),
        points,
        svg: trendPlot(points, buildStyle(build), { limit, changes: changePoints, decimals: m.decimals }),
      };
      let entry = scenarios.get(scenario);
      if (!entry) {
        entry = { id: scenario, anchor: `trend-${scenario}`, lines: [], changeCount: 0 };
        scenarios.set(scenario, entry);
      }
      entry.lines.push(line);
      entry.changeCount += line.changes.length;
    }
  }
  const nights = store.nights();
  const list = [...scenarios.values()];
  return {
    title: 'Footing history: trends and change points',
    generatedAt: new Date().toISOString(),
    nights,
    firstNight: nights[0]?.startedAt ?? null,
    lastNight: nights[nights.length - 1]?.startedAt ?? null,
    alpha: options.changePoints?.alpha ?? DEFAULT_ALPHA,
    scenarios: list,
    changeCount: list.reduce((n, s) => n + s.changeCount, 0),
  };
}
