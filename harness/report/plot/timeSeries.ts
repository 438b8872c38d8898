// The report's time-series plots (friction use, normal force, slip distance, governor, loop time),
// each a function from plot data to an SVG string built from numbers only (no scenario or build
// text ever enters these strings; labels are ours). Long series are merged down to about the
// plot's pixel width with the min/max rule of score/series/buckets.ts, so peaks stay. The floor
// map is floor.ts, the suite overview's dot rows overview.ts.

import { groupRanges, mergeGroups } from '../../score/series/buckets.js';
import type { FrictionMap } from '../../plant/types.js';
import type { MinMaxSeries, RunSeries, SlipSegment } from '../../score/series/types.js';
import { bandsPath, envelopePath, linePath, markerPath } from './path.js';
import { CONE_COLOUR, GRID, INK, muColour, SLIP_COLOUR, STANCE_SHADE, type BuildStyle } from './palette.js';
import { linearScale, niceCeil, niceTicks, type Scale } from './scale.js';
import { asSvg, escapeXml, label, num, type SvgMarkup } from './svg.js';

export const PLOT_WIDTH = 320;
/** Buckets drawn per time plot: about one per 1.5 px of the plot's data area. */
export const PLOT_BUCKETS = 160;
const LEFT = 54;
const RIGHT = 8;

interface TimeGrid {
  x0: number[];
  x1: number[];
  x: number[];
  start: number[];
  end: number[];
  scale: Scale;
}

function timeGrid(series: RunSeries, tMax_s: number, target = PLOT_BUCKETS): TimeGrid {
  const n = series.t_s.length;
  const { start, end } = groupRanges(n, target);
  const scale = linearScale(0, tMax_s, LEFT, PLOT_WIDTH - RIGHT);
  const bucketSpan_s = series.bucketTicks * series.controlPeriod_s;
  const x0 = start.map((k) => scale(Math.max(0, series.t_s[k] - bucketSpan_s)));
  const x1 = end.map((e) => scale(series.t_s[e - 1]));
  const x = end.map((e, g) => (x0[g] + scale(series.t_s[e - 1])) / 2);
  return { x0, x1, x, start, end, scale };
}

function mergeMinMax(s: MinMaxSeries, grid: TimeGrid): { min: (number | null)[]; max: (number | null)[] } {
  return mergeGroups(s, grid.start, grid.end);
}

const anyIn = (values: readonly number[], grid: TimeGrid, g: number, test: (v: number) => boolean) => {
  for (let k = grid.start[g]; k < grid.end[g]; k++) if (test(values[k])) return true;
  return false;
};
const meanIn = (values: readonly number[], grid: TimeGrid, g: number) => {
  let sum = 0;
  for (let k = grid.start[g]; k < grid.end[g]; k++) sum += values[k];
  return sum / Math.max(1, grid.end[g] - grid.start[g]);
};

function timeAxis(scale: Scale, tMax_s: number, y: number): string {
  // data-y: where the page script redraws the ticks for a zoomed window.
  let out = `<g class="axis taxis" data-y="${num(y)}">`;
  for (const t of niceTicks(0, tMax_s, 6)) {
    const x = scale(t);
    out += `<path d="M${num(x)} ${num(y)}v3" stroke="${INK}"/><text x="${num(x)}" y="${num(y + 12)}" text-anchor="middle">${label(t, 2)}</text>`;
  }
  out += `<text x="${LEFT - 10}" y="${num(y + 12)}" text-anchor="end" class="unit">t (s)</text></g>`;
  return out;
}

function open(width: number, height: number, kind: string, tMax_s?: number): string {
  const range = tMax_s === undefined ? '' : ` data-t0="${LEFT}" data-t1="${PLOT_WIDTH - RIGHT}" data-tmax="${num(tMax_s * 1000)}"`;
  return `<svg class="plot ${kind}" viewBox="0 0 ${width} ${num(height)}" width="${width}" height="${num(height)}" role="img"${range}>`;
}

/**
 * The clip every time plot's data group uses (one definition for the page: all time plots share
 * PLOT_WIDTH and LEFT). The zoom script scales the `g.tz` group inside it along x only.
 */
export function timeClipDefinition(): SvgMarkup {
  return asSvg(`<clipPath id="tclip" clipPathUnits="userSpaceOnUse"><rect x="${LEFT}" y="0" width="${PLOT_WIDTH - RIGHT - LEFT}" height="4000"/></clipPath>`);
}
const zoomOpen = '<g clip-path="url(#tclip)"><g class="tz">';
const zoomClose = '</g></g>';

/**
 * A plotted series path with what the page's CSV export needs to read its values back: its name
 * and the linear map of its y pixels (`data-y="yPixelOfLo yPixelOfHi lo hi"`); x maps by the plot's
 * data-t0 / data-t1 / data-tmax. Names are ours or leg names from the robot file (escaped).
 */
function seriesPath(cls: string, name: string, d: string, yLo_px: number, yHi_px: number, lo: number, hi: number, style: string): string {
  return `<path class="series ${cls}" data-name="${escapeXml(name)}" data-y="${num(yLo_px)} ${num(yHi_px)} ${lo} ${hi}" d="${d}"${style}/>`;
}

/** A time-axis event drawn on every time plot of a run: a push, a command change or a fall. */
export interface TimeEvent {
  t_s: number;
  kind: 'push' | 'command' | 'fall';
  /** Our words with numbers, e.g. "push 120 N"; shown as the marker's hover title. */
  text: string;
}

const EVENT_STYLE: Record<TimeEvent['kind'], string> = {
  push: `stroke="${SLIP_COLOUR}" stroke-width="1.2"`,
  command: `stroke="${INK}" stroke-width="0.9" stroke-dasharray="3 2"`,
  fall: `stroke="${SLIP_COLOUR}" stroke-width="2" stroke-dasharray="1 1.5"`,
};

/** Vertical event lines; the hover title only where asked (the first strip of a plot), to keep pages small. */
function eventMarks(events: readonly TimeEvent[], scale: Scale, top: number, bottom: number, titled = true): string {
  let out = '';
  for (const e of events) {
    const d = `M${num(scale(e.t_s))} ${num(top)}V${num(bottom)}`;
    out += titled
      ? `<path class="event ${e.kind}" d="${d}" ${EVENT_STYLE[e.kind]}><title>${escapeXml(`${e.text} at ${label(e.t_s, 2)} s`)}</title></path>`
      : `<path class="event ${e.kind}" d="${d}" ${EVENT_STYLE[e.kind]}/>`;
  }
  return out;
}

/** The label of foot i: the robot's leg name when the series carries one, else "foot i". */
export function footLabel(series: RunSeries, i: number): string {
  const names = (series as RunSeries & { legNames?: unknown }).legNames;
  const name = Array.isArray(names) && typeof names[i] === 'string' ? names[i] : null;
  return name ?? `foot ${i}`;
}

const STRIP_HEIGHT = 58;
const STRIP_GAP = 9;
const USE_TOP = 1.3;

/** Friction use |f_t|/(μs·f_n) per foot over time: one strip per foot, cone at 1.0, stance shaded. */
export function frictionUsePlot(series: RunSeries, tMax_s: number, events: readonly TimeEvent[] = []): SvgMarkup {
  return footStrips(series, tMax_s, events, 'friction-use', 0, USE_TOP, (foot) => foot.frictionUse, (i) => `${footLabel(series, i)} friction use`, (y) =>
    `<path class="cone" d="M${LEFT} ${num(y(1))}H${PLOT_WIDTH - RIGHT}" stroke="${CONE_COLOUR}" stroke-dasharray="4 2"/>` +
    `<text x="${LEFT - 3}" y="${num(y(1) + 3)}" text-anchor="end">1</text>`, '|f_t|/(μs·f_n)');
}

/** Normal force per foot over time, shared force axis across builds (forceMax_N). */
export function normalForcePlot(series: RunSeries, tMax_s: number, forceMax_N: number, events: readonly TimeEvent[] = []): SvgMarkup {
  return footStrips(series, tMax_s, events, 'normal-force', 0, forceMax_N, (foot) => foot.normalForce_N, (i) => `${footLabel(series, i)} normal force (N)`, (y) =>
    `<path d="M${LEFT} ${num(y(series.loadedThreshold_N))}H${PLOT_WIDTH - RIGHT}" stroke="${GRID}" stroke-dasharray="2 2"/>` +
    `<text x="${LEFT - 3}" y="${num(y(forceMax_N) + 8)}" text-anchor="end">${label(forceMax_N, 0)}</text>`, 'f_n (N)');
}

/** Small multiples per foot on one time axis: stance shaded, slipping ticks marked, events drawn. */
function footStrips(
  series: RunSeries,
  tMax_s: number,
  events: readonly TimeEvent[],
  kind: string,
  lo: number,
  hi: number,
  pick: (foot: RunSeries['feet'][number]) => MinMaxSeries,
  name: (i: number) => string,
  guides: (y: Scale) => string,
  unit: string,
): SvgMarkup {
  const grid = timeGrid(series, tMax_s);
  const n = series.footCount;
  const height = 14 + n * (STRIP_HEIGHT + STRIP_GAP) + 14;
  let out = open(PLOT_WIDTH, height, kind, tMax_s);
  out += `<text x="${LEFT}" y="9" class="unit">${escapeXml(unit)}</text>`;
  for (let i = 0; i < n; i++) {
    const foot = series.feet[i];
    const top = 14 + i * (STRIP_HEIGHT + STRIP_GAP);
    const bottom = top + STRIP_HEIGHT;
    const y = linearScale(lo, hi, bottom, top);
    const stance = bandsPath(grid.x0, grid.x1, (g) => meanIn(foot.stance, grid, g) >= 0.5, top, bottom);
    const slip = bandsPath(grid.x0, grid.x1, (g) => anyIn(foot.slipping, grid, g, (v) => v === 1), bottom + 1, bottom + 4);
    const merged = mergeMinMax(pick(foot), grid);
    const clamp = (v: number | null) => (v === null ? null : y(Math.min(hi, Math.max(lo, v))));
    out +=
      `<path d="M${LEFT} ${num(bottom)}H${PLOT_WIDTH - RIGHT}" stroke="${GRID}"/>` +
      guides(y) +
      `<text x="${LEFT - 3}" y="${num(bottom)}" text-anchor="end">${label(lo, 0)}</text>` +
      `<text x="2" y="${num(top + 11)}" class="foot">${escapeXml(footLabel(series, i))}</text>` +
      zoomOpen +
      `<path class="stance" d="${stance}" fill="${STANCE_SHADE}" fill-opacity="0.8"/>` +
      seriesPath('', name(i), envelopePath(grid.x, merged.min.map(clamp), merged.max.map(clamp)), bottom, top, lo, hi, ` fill="none" stroke="${INK}" stroke-width="1.1" stroke-linejoin="round"`) +
      (slip ? `<path class="slip" d="${slip}" fill="${SLIP_COLOUR}"/>` : '') +
      eventMarks(events, grid.scale, top, bottom, i === 0) +
      zoomClose;
  }
  out += timeAxis(grid.scale, tMax_s, height - 14) + '</svg>';
  return asSvg(out);
}

/** Total slip distance accumulated over time, every build overlaid (colour + dash + end marker). */
export function slipDistancePlot(runs: { series: RunSeries; style: BuildStyle; build: string }[], tMax_s: number, events: readonly TimeEvent[] = []): SvgMarkup {
  const height = 170;
  const top = 8;
  const bottom = height - 18;
  let dMax = 0;
  const totals = runs.map(({ series }) =>
    series.t_s.map((_, k) => {
      let sum = 0;
      for (const foot of series.feet) sum += foot.slipDistance_m[k];
      dMax = Math.max(dMax, sum);
      return sum;
    }),
  );
  const yMax = niceCeil(Math.max(dMax, 0.01), 4);
  const y = linearScale(0, yMax, bottom, top);
  const x = linearScale(0, tMax_s, LEFT, PLOT_WIDTH - RIGHT);
  let out = open(PLOT_WIDTH, height, 'slip-distance', tMax_s);
  const millimetres = yMax < 0.1;
  for (const v of niceTicks(0, yMax, 4)) {
    out += `<path d="M${LEFT} ${num(y(v))}H${PLOT_WIDTH - RIGHT}" stroke="${GRID}"/><text x="${LEFT - 3}" y="${num(y(v) + 3)}" text-anchor="end">${millimetres ? label(v * 1000, 0) : label(v, 2)}</text>`;
  }
  out += `<text x="${LEFT + 2}" y="${top + 8}" class="unit">slip (${millimetres ? 'mm' : 'm'})</text>`;
  out += zoomOpen + eventMarks(events, x, top, bottom);
  let ends = '';
  runs.forEach(({ series, style, build }, r) => {
    const indices = evenSample(series.t_s.length, PLOT_BUCKETS);
    const xs = indices.map((k) => x(series.t_s[k]));
    const ys = indices.map((k) => y(totals[r][k]));
    out += seriesPath('', `${build} slip distance (m)`, linePath(xs, ys), bottom, top, 0, yMax, ` fill="none" stroke="${style.colour}" stroke-width="1.6"${style.dash ? ` stroke-dasharray="${style.dash}"` : ''}`);
    if (xs.length > 0) ends += `<path d="${markerPath(style.shape, xs[xs.length - 1], ys[ys.length - 1], 3.5)}" fill="${style.colour}" stroke="#fff" stroke-width="0.8"/>`;
  });
  // End markers stay outside the zoom group (a scaled marker would smear); they mark the run's end.
  out += zoomClose + `<g class="ends">${ends}</g>` + timeAxis(x, tMax_s, bottom) + '</svg>';
  return asSvg(out);
}

/** About `target` indices spread evenly over 0 … n − 1, both ends included. */
export function evenSample(n: number, target: number): number[] {
  const step = Math.max(1, Math.ceil(n / target));
  const out: number[] = [];
  for (let k = 0; k < n; k += step) out.push(k);
  if (n > 0 && out[out.length - 1] !== n - 1) out.push(n - 1);
  return out;
}

/** True when target and applied stay within 1e-9 of one value all run (nothing to plot). */
export function governorAxisFlat(series: RunSeries, axisIndex: number): boolean {
  const axis = series.governor[axisIndex];
  let lo = Infinity;
  let hi = -Infinity;
  for (const list of [axis.target.min, axis.target.max, axis.applied.min, axis.applied.max]) {
    for (const v of list) {
      if (v === null) continue;
      lo = Math.min(lo, v);
      hi = Math.max(hi, v);
    }
  }
  return !(hi - lo > 1e-9);
}

/**
 * The unit of a telemetry scalar from its name: the project names units in names (`_mps`, `_N`…);
 * the reference governor's axes are the commanded velocities vx, vy (m/s) and yawRate (rad/s).
 */
export function unitOf(name: string): string {
  const axis = name.slice(name.lastIndexOf('.') + 1);
  if (axis === 'vx' || axis === 'vy' || axis === 'vz') return 'm/s';
  if (axis === 'yawRate' || axis === 'wz') return 'rad/s';
  const suffix = /_(mps|radps|N|Nm|m|s|us|ms|rad|kg|Hz|J|W)$/.exec(axis)?.[1];
  const units: Record<string, string> = { mps: 'm/s', radps: 'rad/s', N: 'N', Nm: 'N·m', m: 'm', s: 's', us: 'µs', ms: 'ms', rad: 'rad', kg: 'kg', Hz: 'Hz', J: 'J', W: 'W' };
  return suffix ? units[suffix] : '1';
}

/** Governor target (dashed) against applied reference (solid) for one axis. */
export function governorPlot(series: RunSeries, axisIndex: number, tMax_s: number, events: readonly TimeEvent[] = []): SvgMarkup {
  const axis = series.governor[axisIndex];
  return scalarPlot(series, tMax_s, events, 'governor', unitOf(`governor.${axis.axis}`), [
    { cls: 'target', name: `governor.target.${axis.axis}`, values: axis.target, style: ` fill="none" stroke="${INK}" stroke-width="1.2" stroke-dasharray="5 3"` },
    { cls: 'applied', name: `governor.applied.${axis.axis}`, values: axis.applied, style: ` fill="none" stroke="#0072B2" stroke-width="1.6"` },
  ]);
}

/** One telemetry scalar over time (min/max envelope), y axis in its unit. */
export function telemetryPlot(series: RunSeries, name: string, values: MinMaxSeries, tMax_s: number, events: readonly TimeEvent[] = []): SvgMarkup {
  return scalarPlot(series, tMax_s, events, 'telemetry', unitOf(name), [{ cls: 'value', name, values, style: ` fill="none" stroke="#0072B2" stroke-width="1.4"` }]);
}

function scalarPlot(
  series: RunSeries,
  tMax_s: number,
  events: readonly TimeEvent[],
  kind: string,
  unit: string,
  lines: { cls: string; name: string; values: MinMaxSeries; style: string }[],
): SvgMarkup {
  const grid = timeGrid(series, tMax_s);
  const merged = lines.map((l) => mergeMinMax(l.values, grid));
  let lo = 0;
  let hi = 0;
  for (const m of merged) for (const v of [...m.min, ...m.max]) {
    if (v === null) continue;
    lo = Math.min(lo, v);
    hi = Math.max(hi, v);
  }
  if (hi - lo < 1e-6) hi = lo + 1;
  const pad = (hi - lo) * 0.08;
  const height = 120;
  const top = 14;
  const bottom = height - 18;
  const y0 = lo - pad;
  const y1 = hi + pad;
  const y = linearScale(y0, y1, bottom, top);
  const map = (values: (number | null)[]) => values.map((v) => (v === null ? null : y(v)));
  let out = open(PLOT_WIDTH, height, kind, tMax_s);
  out += `<text x="${LEFT}" y="9" class="unit">${escapeXml(unit)}</text>`;
  for (const v of niceTicks(y0, y1, 3)) {
    out += `<path d="M${LEFT} ${num(y(v))}H${PLOT_WIDTH - RIGHT}" stroke="${GRID}"/><text x="${LEFT - 3}" y="${num(y(v) + 3)}" text-anchor="end">${label(v, 2)}</text>`;
  }
  out += zoomOpen + eventMarks(events, grid.scale, top, bottom);
  lines.forEach((l, k) => (out += seriesPath(l.cls, `${l.name} (${unit})`, envelopePath(grid.x, map(merged[k].min), map(merged[k].max)), bottom, top, Number(y0.toPrecision(8)), Number(y1.toPrecision(8)), l.style)));
  out += zoomClose + timeAxis(grid.scale, tMax_s, bottom) + '</svg>';
  return asSvg(out);
}

/** Loop time per tick as a histogram on a log axis, with the budget line; bars over it hatched. */
export function loopTimePlot(series: RunSeries): SvgMarkup {
  const lt = series.loopTime;
  const height = 100;
  const top = 6;
  const bottom = height - 18;
  const edge = (k: number) => lt.start_us * lt.ratio ** k;
  const first = lt.bins.length > 0 ? edge(lt.bins[0][0]) : lt.budget_us / 100;
  const last = lt.bins.length > 0 ? edge(lt.bins[lt.bins.length - 1][0] + 1) : lt.budget_us;
  const d0 = Math.log10(Math.min(first, lt.budget_us / 10));
  const d1 = Math.log10(Math.max(last, lt.budget_us * 2));
  // Clamped to 1 ns … 1000 s (the series validator's range), so no input can ask for endless decades.
  const lo = Math.max(-3, Math.min(8, Math.floor(d0)));
  const hi = Math.max(lo + 1, Math.min(9, Math.ceil(d1)));
  const x = linearScale(lo, hi, LEFT, PLOT_WIDTH - RIGHT);
  const maxCount = Math.max(1, ...lt.bins.map(([, c]) => c));
  const y = linearScale(0, maxCount, bottom, top);
  let under = '';
  let over = '';
  for (const [k, count] of lt.bins) {
    const a = x(Math.log10(edge(k)));
    const b = x(Math.log10(edge(k + 1)));
    const bar = `M${num(a)} ${num(bottom)}V${num(y(count))}H${num(Math.max(b, a + 0.8))}V${num(bottom)}Z`;
    if (edge(k) >= lt.budget_us) over += bar;
    else under += bar;
  }
  const budgetX = x(Math.log10(lt.budget_us));
  let out = open(PLOT_WIDTH, height, 'loop-time');
  out += `<path d="M${LEFT} ${bottom}H${PLOT_WIDTH - RIGHT}" stroke="${GRID}"/>`;
  out += `<path class="series" d="${under || `M${LEFT} ${bottom}h0`}" fill="#56B4E9" stroke="#2b6f96" stroke-width="0.5"/>`;
  if (over) out += `<path class="series over" d="${over}" fill="url(#hatch-over)" stroke="${SLIP_COLOUR}" stroke-width="0.6"/>`;
  out += `<path d="M${num(budgetX)} ${top - 2}V${bottom}" stroke="${SLIP_COLOUR}" stroke-width="1.4" stroke-dasharray="4 2"/>`;
  out += `<text x="${num(budgetX - 3)}" y="${top + 8}" text-anchor="end" class="budget">budget</text>`;
  for (let p = lo; p <= hi; p++) {
    const us = 10 ** p;
    const text = us >= 1e6 ? `${label(us / 1e6, 0)} s` : us >= 1e3 ? `${label(us / 1e3, 0)} ms` : `${label(us, 1)} µs`;
    const anchor = p === hi ? 'end' : p === lo ? 'start' : 'middle';
    out += `<path d="M${num(x(p))} ${bottom}v3" stroke="${INK}"/><text x="${num(x(p))}" y="${bottom + 12}" text-anchor="${anchor}">${text}</text>`;
  }
  return asSvg(out + '</svg>');
}
