// The report's plots, each a function from plot data to an SVG string built from numbers only
// (no scenario or build text ever enters these strings; labels are ours). Long series are merged
// down to about the plot's pixel width with the min/max rule of series/buckets.ts, so peaks stay.

import { groupRanges } from '../../score/series/buckets.js';
import type { FrictionMap } from '../../plant/types.js';
import type { MinMaxSeries, RunSeries, SlipSegment } from '../../score/series/types.js';
import { bandsPath, envelopePath, linePath, markerPath } from './path.js';
import { CONE_COLOUR, GRID, INK, muColour, SLIP_COLOUR, STANCE_SHADE, type BuildStyle } from './palette.js';
import { linearScale, niceCeil, niceTicks, type Scale } from './scale.js';
import { asSvg, label, num, type SvgMarkup } from './svg.js';

export const PLOT_WIDTH = 320;
/** Buckets drawn per time plot: about one per 1.5 px of the plot's data area. */
export const PLOT_BUCKETS = 160;
/** Slip segments drawn per floor panel (the longest ones; the rest are counted in the caption). */
export const MAX_DRAWN_SLIPS = 60;
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
  const min: (number | null)[] = [];
  const max: (number | null)[] = [];
  for (let g = 0; g < grid.start.length; g++) {
    let lo: number | null = null;
    let hi: number | null = null;
    for (let k = grid.start[g]; k < grid.end[g]; k++) {
      const a = s.min[k];
      const b = s.max[k];
      if (a !== null && (lo === null || a < lo)) lo = a;
      if (b !== null && (hi === null || b > hi)) hi = b;
    }
    min.push(lo);
    max.push(hi);
  }
  return { min, max };
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
  let out = `<g class="axis">`;
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

const STRIP_HEIGHT = 34;
const STRIP_GAP = 7;
const USE_TOP = 1.3;

/** Friction use |f_t|/(μs·f_n) per foot over time: one strip per foot, cone at 1.0, stance shaded. */
export function frictionUsePlot(series: RunSeries, tMax_s: number): SvgMarkup {
  const grid = timeGrid(series, tMax_s);
  const n = series.footCount;
  const height = 4 + n * (STRIP_HEIGHT + STRIP_GAP) + 14;
  let out = open(PLOT_WIDTH, height, 'friction-use', tMax_s);
  for (let i = 0; i < n; i++) {
    const foot = series.feet[i];
    const top = 4 + i * (STRIP_HEIGHT + STRIP_GAP);
    const bottom = top + STRIP_HEIGHT;
    const y = linearScale(0, USE_TOP, bottom, top);
    const stance = bandsPath(grid.x0, grid.x1, (g) => meanIn(foot.stance, grid, g) >= 0.5, top, bottom);
    const slip = bandsPath(grid.x0, grid.x1, (g) => anyIn(foot.slipping, grid, g, (v) => v === 1), bottom + 1, bottom + 4);
    const merged = mergeMinMax(foot.frictionUse, grid);
    const clamp = (v: number | null) => (v === null ? null : y(Math.min(USE_TOP, Math.max(0, v))));
    out +=
      `<path class="stance" d="${stance}" fill="${STANCE_SHADE}"/>` +
      `<path d="M${LEFT} ${num(bottom)}H${PLOT_WIDTH - RIGHT}" stroke="${GRID}"/>` +
      `<path class="cone" d="M${LEFT} ${num(y(1))}H${PLOT_WIDTH - RIGHT}" stroke="${CONE_COLOUR}" stroke-dasharray="4 2"/>` +
      `<path class="series" d="${envelopePath(grid.x, merged.min.map(clamp), merged.max.map(clamp))}" fill="none" stroke="${INK}" stroke-width="1.1" stroke-linejoin="round"/>` +
      (slip ? `<path class="slip" d="${slip}" fill="${SLIP_COLOUR}"/>` : '') +
      `<text x="2" y="${num(top + 11)}" class="foot">foot ${i}</text>` +
      `<text x="${LEFT - 3}" y="${num(y(1) + 3)}" text-anchor="end">1</text>` +
      `<text x="${LEFT - 3}" y="${num(bottom)}" text-anchor="end">0</text>`;
  }
  out += timeAxis(grid.scale, tMax_s, height - 14) + '</svg>';
  return asSvg(out);
}

/** Normal force per foot over time, shared force axis across builds (forceMax_N). */
export function normalForcePlot(series: RunSeries, tMax_s: number, forceMax_N: number): SvgMarkup {
  const grid = timeGrid(series, tMax_s);
  const n = series.footCount;
  const height = 4 + n * (STRIP_HEIGHT + STRIP_GAP) + 14;
  let out = open(PLOT_WIDTH, height, 'normal-force', tMax_s);
  for (let i = 0; i < n; i++) {
    const foot = series.feet[i];
    const top = 4 + i * (STRIP_HEIGHT + STRIP_GAP);
    const bottom = top + STRIP_HEIGHT;
    const y = linearScale(0, forceMax_N, bottom, top);
    const merged = mergeMinMax(foot.normalForce_N, grid);
    const clamp = (v: number | null) => (v === null ? null : y(Math.min(forceMax_N, Math.max(0, v))));
    out +=
      `<path class="stance" d="${bandsPath(grid.x0, grid.x1, (g) => meanIn(foot.stance, grid, g) >= 0.5, top, bottom)}" fill="${STANCE_SHADE}"/>` +
      `<path d="M${LEFT} ${num(bottom)}H${PLOT_WIDTH - RIGHT}" stroke="${GRID}"/>` +
      `<path d="M${LEFT} ${num(y(series.loadedThreshold_N))}H${PLOT_WIDTH - RIGHT}" stroke="${GRID}" stroke-dasharray="2 2"/>` +
      `<path class="series" d="${envelopePath(grid.x, merged.min.map(clamp), merged.max.map(clamp))}" fill="none" stroke="${INK}" stroke-width="1.1" stroke-linejoin="round"/>` +
      `<text x="2" y="${num(top + 11)}" class="foot">foot ${i}</text>` +
      `<text x="${LEFT - 3}" y="${num(top + 8)}" text-anchor="end">${label(forceMax_N, 0)}</text>` +
      `<text x="${LEFT - 3}" y="${num(bottom)}" text-anchor="end">0</text>`;
  }
  out += timeAxis(grid.scale, tMax_s, height - 14) + `<text x="2" y="${num(height - 20)}" class="unit">f_n in N</text></svg>`;
  return asSvg(out);
}

/** Total slip distance accumulated over time, every build overlaid (colour + dash + end marker). */
export function slipDistancePlot(runs: { series: RunSeries; style: BuildStyle }[], tMax_s: number): SvgMarkup {
  const height = 150;
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
  out += `<text x="${LEFT + 2}" y="${top + 8}" class="unit">${millimetres ? 'mm' : 'm'}</text>`;
  runs.forEach(({ series, style }, r) => {
    const indices = evenSample(series.t_s.length, PLOT_BUCKETS);
    const xs = indices.map((k) => x(series.t_s[k]));
    const ys = indices.map((k) => y(totals[r][k]));
    out += `<path class="series" d="${linePath(xs, ys)}" fill="none" stroke="${style.colour}" stroke-width="1.6"${style.dash ? ` stroke-dasharray="${style.dash}"` : ''}/>`;
    if (xs.length > 0) out += `<path d="${markerPath(style.shape, xs[xs.length - 1], ys[ys.length - 1], 3.5)}" fill="${style.colour}" stroke="#fff" stroke-width="0.8"/>`;
  });
  out += timeAxis(x, tMax_s, bottom) + '</svg>';
  return asSvg(out);
}

function evenSample(n: number, target: number): number[] {
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

/** Governor target (dashed) against applied reference (solid) for one axis. */
export function governorPlot(series: RunSeries, axisIndex: number, tMax_s: number): SvgMarkup {
  const axis = series.governor[axisIndex];
  const grid = timeGrid(series, tMax_s);
  const target = mergeMinMax(axis.target, grid);
  const applied = mergeMinMax(axis.applied, grid);
  let lo = 0;
  let hi = 0;
  for (const v of [...target.min, ...target.max, ...applied.min, ...applied.max]) {
    if (v === null) continue;
    lo = Math.min(lo, v);
    hi = Math.max(hi, v);
  }
  if (hi - lo < 1e-6) hi = lo + 1;
  const pad = (hi - lo) * 0.08;
  const height = 110;
  const top = 6;
  const bottom = height - 18;
  const y = linearScale(lo - pad, hi + pad, bottom, top);
  const map = (values: (number | null)[]) => values.map((v) => (v === null ? null : y(v)));
  let out = open(PLOT_WIDTH, height, 'governor', tMax_s);
  for (const v of niceTicks(lo - pad, hi + pad, 3)) {
    out += `<path d="M${LEFT} ${num(y(v))}H${PLOT_WIDTH - RIGHT}" stroke="${GRID}"/><text x="${LEFT - 3}" y="${num(y(v) + 3)}" text-anchor="end">${label(v, 2)}</text>`;
  }
  out +=
    `<path class="series target" d="${envelopePath(grid.x, map(target.min), map(target.max))}" fill="none" stroke="${INK}" stroke-width="1.2" stroke-dasharray="5 3"/>` +
    `<path class="series applied" d="${envelopePath(grid.x, map(applied.min), map(applied.max))}" fill="none" stroke="#0072B2" stroke-width="1.6"/>`;
  out += timeAxis(grid.scale, tMax_s, bottom) + '</svg>';
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
  const lo = Math.floor(d0);
  const hi = Math.ceil(d1);
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

// ---- Top view of the floor ----------------------------------------------------------------

export interface FloorExtent {
  x0: number;
  x1: number;
  y0: number;
  y1: number;
}

/** The smallest floor rectangle holding every build's trunk path and footholds, padded 0.4 m. */
export function floorExtent(all: RunSeries[]): FloorExtent {
  let x0 = Infinity;
  let x1 = -Infinity;
  let y0 = Infinity;
  let y1 = -Infinity;
  const take = (x: number, y: number) => {
    if (!Number.isFinite(x) || !Number.isFinite(y)) return;
    x0 = Math.min(x0, x);
    x1 = Math.max(x1, x);
    y0 = Math.min(y0, y);
    y1 = Math.max(y1, y);
  };
  for (const s of all) {
    s.trunk.x_m.forEach((x, k) => take(x, s.trunk.y_m[k]));
    for (const f of s.footholds) take(f.x_m, f.y_m);
  }
  if (!Number.isFinite(x0)) return { x0: -1, x1: 1, y0: -1, y1: 1 };
  const pad = 0.4;
  return { x0: x0 - pad, x1: x1 + pad, y0: y0 - pad, y1: y1 + pad };
}

interface FloorFrame {
  s: number;
  px: (x: number) => number;
  py: (y: number) => number;
  width: number;
  height: number;
  tx: number;
  ty: number;
}

const FLOOR_PAD = 6;

function floorFrame(extent: FloorExtent): FloorFrame {
  const inner = PLOT_WIDTH - 2 * FLOOR_PAD;
  const spanX = extent.x1 - extent.x0;
  const spanY = extent.y1 - extent.y0;
  // Equal scale on both axes (a map); tall floors are limited to a square panel.
  const s = Math.min(inner / spanX, inner / spanY);
  const height = spanY * s + 2 * FLOOR_PAD + 14;
  const tx = FLOOR_PAD - s * extent.x0;
  const ty = FLOOR_PAD + s * extent.y1;
  return { s, px: (x) => tx + s * x, py: (y) => ty - s * y, width: PLOT_WIDTH, height, tx, ty };
}

/** The friction map in world metres, drawn once per scenario and placed by each floor panel. */
export function floorDefinition(map: FrictionMap, id: string): SvgMarkup {
  let out = `<g id="${id}" shape-rendering="crispEdges">`;
  const raster = map.raster;
  if (raster) {
    const nx = raster.staticFriction.length;
    for (let i = 0; i < nx; i++) {
      const column = raster.staticFriction[i];
      let j = 0;
      while (j < column.length) {
        let k = j;
        while (k + 1 < column.length && column[k + 1] === column[j]) k++;
        const x = raster.origin_m[0] + i * raster.cell_m;
        const y = raster.origin_m[1] + j * raster.cell_m;
        out += `<rect x="${coord(x)}" y="${coord(y)}" width="${coord(raster.cell_m)}" height="${coord((k - j + 1) * raster.cell_m)}" fill="${muColour(column[j])}"/>`;
        j = k + 1;
      }
    }
  }
  for (const patch of map.patches) {
    const fill = muColour(patch.material.staticFriction);
    const edge = ` fill="${fill}" stroke="${INK}" stroke-opacity="0.35" stroke-width="1" vector-effect="non-scaling-stroke"`;
    const shape = patch.shape;
    if (shape.kind === 'rect') {
      const xa = Math.min(shape.min_m[0], shape.max_m[0]);
      const ya = Math.min(shape.min_m[1], shape.max_m[1]);
      out += `<rect x="${coord(xa)}" y="${coord(ya)}" width="${coord(Math.abs(shape.max_m[0] - shape.min_m[0]))}" height="${coord(Math.abs(shape.max_m[1] - shape.min_m[1]))}"${edge}/>`;
    } else if (shape.kind === 'circle') {
      out += `<circle cx="${coord(shape.center_m[0])}" cy="${coord(shape.center_m[1])}" r="${coord(shape.radius_m)}"${edge}/>`;
    } else {
      out += `<path d="M${shape.vertices_m.map(([x, y]) => `${coord(x)} ${coord(y)}`).join('L')}Z"${edge}/>`;
    }
  }
  return asSvg(out + '</g>');
}

/** World coordinates in metres keep 4 decimals (0.1 mm) so small patches stay exact. */
function coord(value: number): string {
  if (!Number.isFinite(value)) return '0';
  const r = Math.round(value * 1e4) / 1e4;
  return r === 0 ? '0' : String(r);
}

/** One build's top view: friction map, commanded path, trunk path, footholds, slip segments. */
export function floorPlot(series: RunSeries, extent: FloorExtent, definitionId: string, clipId: string, fell: boolean): { svg: SvgMarkup; slipsDrawn: number; slipsTotal: number; longest: SlipSegment | null } {
  const f = floorFrame(extent);
  const mapBottom = f.height - 14;
  let out = `<svg class="plot floor" viewBox="0 0 ${f.width} ${num(f.height)}" width="${f.width}" height="${num(f.height)}" role="img">`;
  out += `<defs><clipPath id="${clipId}"><rect x="${FLOOR_PAD}" y="${FLOOR_PAD}" width="${num(f.width - 2 * FLOOR_PAD)}" height="${num(mapBottom - FLOOR_PAD)}"/></clipPath></defs>`;
  out += `<g clip-path="url(#${clipId})">`;
  out += `<rect x="0" y="0" width="${f.width}" height="${num(f.height)}" fill="${muColour(series.friction.default.staticFriction)}"/>`;
  out += `<use href="#${definitionId}" transform="matrix(${num4(f.s)} 0 0 ${num4(-f.s)} ${num(f.tx)} ${num(f.ty)})"/>`;
  const indices = evenSample(series.trunk.x_m.length, 220);
  const ref = linePath(indices.map((k) => f.px(series.trunk.referenceX_m[k])), indices.map((k) => f.py(series.trunk.referenceY_m[k])));
  const path = linePath(indices.map((k) => f.px(series.trunk.x_m[k])), indices.map((k) => f.py(series.trunk.y_m[k])));
  out += `<path class="reference" d="${ref}" fill="none" stroke="#fff" stroke-width="1.2" stroke-dasharray="3 3" opacity="0.9"/>`;
  out += `<path d="${path}" fill="none" stroke="#fff" stroke-width="3.4" stroke-linejoin="round" opacity="0.85"/>`;
  out += `<path class="series trunk" d="${path}" fill="none" stroke="${INK}" stroke-width="1.5" stroke-linejoin="round"/>`;
  // Footholds as rings: zero-length round-capped strokes, ink then white (2 short paths for all).
  let holds = '';
  for (const h of series.footholds) holds += `M${num(f.px(h.x_m))} ${num(f.py(h.y_m))}h0`;
  if (holds) out += `<path class="footholds" d="${holds}" stroke="${INK}" stroke-width="4.2" stroke-linecap="round"/><path d="${holds}" stroke="#fff" stroke-width="2.4" stroke-linecap="round"/>`;
  const slips = [...series.slips].sort((a, b) => b.distance_m - a.distance_m).slice(0, MAX_DRAWN_SLIPS);
  let slipD = '';
  for (const s of slips) slipD += `M${num(f.px(s.from_m[0]))} ${num(f.py(s.from_m[1]))}L${num(f.px(s.to_m[0]))} ${num(f.py(s.to_m[1]))}`;
  if (slipD) out += `<path d="${slipD}" stroke="#fff" stroke-width="5.5" stroke-linecap="round"/><path class="slips" d="${slipD}" stroke="${SLIP_COLOUR}" stroke-width="3.2" stroke-linecap="round"/>`;
  const longest = slips[0];
  if (longest) {
    const lx = f.px(longest.to_m[0]);
    const ly = f.py(longest.to_m[1]);
    out += `<g class="slip-mark"><title>longest slip: foot ${longest.foot}, ${label(longest.distance_m * 1000, 1)} mm, ${label(longest.start_s, 2)}–${label(longest.end_s, 2)} s</title><circle cx="${num(lx)}" cy="${num(ly)}" r="6" fill="none" stroke="${SLIP_COLOUR}" stroke-width="1.4"/></g>`;
  }
  const n = series.trunk.x_m.length;
  if (n > 0) {
    out += `<path d="${markerPath('square', f.px(series.trunk.x_m[0]), f.py(series.trunk.y_m[0]), 3)}" fill="#fff" stroke="${INK}"><title>start</title></path>`;
    const ex = f.px(series.trunk.x_m[n - 1]);
    const ey = f.py(series.trunk.y_m[n - 1]);
    out += fell
      ? `<path d="${markerPath('cross', ex, ey, 6)}" fill="${SLIP_COLOUR}" stroke="#fff" stroke-width="0.8" transform="rotate(45 ${num(ex)} ${num(ey)})"><title>fell here</title></path>`
      : `<path d="${markerPath('triangle', ex, ey, 3.6)}" fill="${INK}" stroke="#fff" stroke-width="0.7"><title>end</title></path>`;
  }
  out += '</g>';
  // Scale bar: the largest of 2, 1, 0.5, 0.2, 0.1 m that fits in a third of the panel.
  const bar_m = [2, 1, 0.5, 0.2, 0.1].find((m) => m * f.s <= f.width / 3) ?? 0.1;
  const y = f.height - 6;
  out += `<path d="M${FLOOR_PAD} ${num(y)}h${num(bar_m * f.s)}" stroke="${INK}" stroke-width="2"/><text x="${num(FLOOR_PAD + bar_m * f.s + 4)}" y="${num(y + 3)}">${label(bar_m, 1)} m</text>`;
  out += `<text x="${f.width - FLOOR_PAD}" y="${num(y + 3)}" text-anchor="end" class="unit">x →, y ↑</text>`;
  return { svg: asSvg(out + '</svg>'), slipsDrawn: slips.length, slipsTotal: series.slips.length + series.dropped.slips, longest: longest ?? null };
}

function num4(value: number): string {
  return String(Math.round(value * 1e4) / 1e4);
}

/** The μs legend: the ramp in steps from 0 to 1.2, with the floor's materials marked. */
export function muLegend(present: number[]): SvgMarkup {
  const width = 260;
  const height = 34;
  const x = linearScale(0, 1.2, 10, width - 10);
  let out = `<svg class="legend mu" viewBox="0 0 ${width} ${height}" width="${width}" height="${height}" role="img">`;
  for (let k = 0; k < 24; k++) {
    const mu = (k + 0.5) * 0.05;
    out += `<rect x="${num(x(k * 0.05))}" y="6" width="${num(x(0.05) - x(0) + 0.3)}" height="10" fill="${muColour(mu)}"/>`;
  }
  out += `<rect x="${num(x(0))}" y="6" width="${num(x(1.2) - x(0))}" height="10" fill="none" stroke="${INK}" stroke-width="0.5"/>`;
  for (const t of [0, 0.2, 0.4, 0.6, 0.8, 1.0, 1.2]) out += `<text x="${num(x(t))}" y="28" text-anchor="middle">${label(t, 1)}</text>`;
  for (const mu of present) out += `<path d="M${num(x(Math.min(1.2, mu)))} 16l-3.5 -5h7z" fill="${INK}"><title>μs ${label(mu, 3)}</title></path>`;
  return asSvg(out + '</svg>');
}

// ---- Suite overview: one row per scenario, one marker per build -------------------------------

export interface DotValue {
  value: number | null;
  style: BuildStyle;
}

export const OVERVIEW_WIDTH = 220;

/**
 * Friction margin min of every build on one line from MARGIN_AXIS[0] to [1], the cone (0) marked
 * and the far side shaded. The axis is cut where the interesting values are (a walking robot's
 * worst margin sits in −0.25 … 0.5); values beyond are drawn hollow at the edge.
 */
export const MARGIN_AXIS: [number, number] = [-0.25, 0.5];
export function marginDots(values: DotValue[]): SvgMarkup {
  const x = linearScale(MARGIN_AXIS[0], MARGIN_AXIS[1], 8, OVERVIEW_WIDTH - 8);
  let out = `<svg class="dots margin" viewBox="0 0 ${OVERVIEW_WIDTH} 22" width="${OVERVIEW_WIDTH}" height="22" role="img">`;
  const [lo, hi] = MARGIN_AXIS;
  out += `<rect x="${num(x(lo))}" y="3" width="${num(x(0) - x(lo))}" height="16" fill="#f6dccb"/>`;
  out += `<path d="M${num(x(lo))} 11H${num(x(hi))}" stroke="${GRID}"/><path d="M${num(x(0))} 2V20" stroke="${CONE_COLOUR}" stroke-dasharray="2 1.5"/>`;
  for (const t of [-0.2, -0.1, 0.1, 0.2, 0.3, 0.4, 0.5]) out += `<path d="M${num(x(t))} 8V14" stroke="${GRID}"/>`;
  for (const v of values) {
    if (v.value === null) continue;
    const inside = v.value >= lo && v.value <= hi;
    const at = x(Math.max(lo, Math.min(hi, v.value)));
    out += inside
      ? `<path class="dot" d="${markerPath(v.style.shape, at, 11, 4.2)}" fill="${v.style.colour}" fill-opacity="0.9" stroke="#fff" stroke-width="0.8"/>`
      : `<path class="dot" d="${markerPath(v.style.shape, at, 11, 4.2)}" fill="#fff" stroke="${v.style.colour}" stroke-width="1.6"/>`;
  }
  return asSvg(out + '</svg>');
}

/** Slip distance of every build on a log axis from 1 mm to 1 m (beyond: at the edges). */
export function slipDots(values: DotValue[]): SvgMarkup {
  const x = linearScale(-3, 0, 8, OVERVIEW_WIDTH - 8);
  const at = (m: number) => x(Math.max(-3, Math.min(0, Math.log10(Math.max(m, 1e-3)))));
  let out = `<svg class="dots slip" viewBox="0 0 ${OVERVIEW_WIDTH} 22" width="${OVERVIEW_WIDTH}" height="22" role="img">`;
  out += `<path d="M${num(x(-3))} 11H${num(x(0))}" stroke="${GRID}"/>`;
  for (const t of [-3, -2, -1, 0]) out += `<path d="M${num(x(t))} 7V15" stroke="${GRID}"/>`;
  for (const v of values) {
    if (v.value === null) continue;
    out += `<path class="dot" d="${markerPath(v.style.shape, at(v.value), 11, 4.2)}" fill="${v.style.colour}" fill-opacity="0.9" stroke="#fff" stroke-width="0.8"/>`;
  }
  return asSvg(out + '</svg>');
}

/** Axis captions for the overview columns (numbers only). */
export function marginAxis(): SvgMarkup {
  const x = linearScale(MARGIN_AXIS[0], MARGIN_AXIS[1], 8, OVERVIEW_WIDTH - 8);
  let out = `<svg class="dots-axis" viewBox="0 0 ${OVERVIEW_WIDTH} 14" width="${OVERVIEW_WIDTH}" height="14" aria-hidden="true">`;
  for (const t of [-0.2, 0, 0.2, 0.4]) out += `<text x="${num(x(t))}" y="11" text-anchor="middle">${label(t, 1)}</text>`;
  return asSvg(out + '</svg>');
}

export function slipAxis(): SvgMarkup {
  const x = linearScale(-3, 0, 8, OVERVIEW_WIDTH - 8);
  let out = `<svg class="dots-axis" viewBox="0 0 ${OVERVIEW_WIDTH} 14" width="${OVERVIEW_WIDTH}" height="14" aria-hidden="true">`;
  const names = ['1 mm', '1 cm', '10 cm', '1 m'];
  const anchors = ['start', 'middle', 'middle', 'end'];
  [-3, -2, -1, 0].forEach((t, k) => (out += `<text x="${num(x(t))}" y="11" text-anchor="${anchors[k]}">${names[k]}</text>`));
  return asSvg(out + '</svg>');
}

/** A legend swatch for a build: its marker and dash, no text (the name is HTML beside it). */
export function buildSwatch(style: BuildStyle): SvgMarkup {
  return asSvg(
    `<svg class="swatch" viewBox="0 0 34 14" width="34" height="14" aria-hidden="true">` +
      `<path d="M1 7H33" stroke="${style.colour}" stroke-width="2"${style.dash ? ` stroke-dasharray="${style.dash}"` : ''}/>` +
      `<path d="${markerPath(style.shape, 17, 7, 4.2)}" fill="${style.colour}" stroke="#fff" stroke-width="0.8"/></svg>`,
  );
}
