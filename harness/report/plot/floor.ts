// The report's top view of the floor: the friction map drawn once per scenario as an SVG
// definition, and per run the trunk path, footholds and slip segments over it. Numbers only, as
// every plot (timeSeries.ts).

import type { FrictionMap } from '../../plant/types.js';
import type { RunSeries, SlipSegment } from '../../score/series/types.js';
import { linePath, markerPath } from './path.js';
import { INK, muColour, SLIP_COLOUR } from './palette.js';
import { linearScale } from './scale.js';
import { asSvg, label, num, type SvgMarkup } from './svg.js';
import { evenSample, PLOT_WIDTH } from './timeSeries.js';
/** Slip segments drawn per floor panel (the longest ones; the rest are counted in the caption). */
export const MAX_DRAWN_SLIPS = 60;

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
