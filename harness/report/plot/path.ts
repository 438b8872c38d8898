// Path builders: data in pixel coordinates in, SVG path `d` strings out (d3-shape in spirit, a few
// lines each). null means "no value here" and breaks the line.

import { num } from './svg.js';

/**
 * A line through the points; a null y starts a new sub-path after the gap. Relative commands
 * (`l dx dy`) after each sub-path's first point keep long series compact; every offset is taken
 * between rounded positions, so rounding never accumulates.
 */
export function linePath(xs: readonly number[], ys: readonly (number | null)[]): string {
  let d = '';
  let pen = false;
  let px = 0;
  let py = 0;
  for (let k = 0; k < xs.length; k++) {
    const y = ys[k];
    if (y === null || !Number.isFinite(y)) {
      pen = false;
      continue;
    }
    const x = tenth(xs[k]);
    const yy = tenth(y);
    d += pen ? 'l' + num((x - px) / 10) + ' ' + num((yy - py) / 10) : 'M' + num(x / 10) + ' ' + num(yy / 10);
    px = x;
    py = yy;
    pen = true;
  }
  return d;
}

/** Position in tenths of a unit, as an integer (the path's resolution). */
const tenth = (value: number): number => Math.round(value * 10);

/**
 * A min/max envelope as one zigzag line: each bucket contributes its min and its max (a vertical
 * `v` step when they differ), so a one-bucket spike stays visible at full height.
 */
export function envelopePath(xs: readonly number[], lows: readonly (number | null)[], highs: readonly (number | null)[]): string {
  let d = '';
  let points = 0;
  let px = 0;
  let py = 0;
  const endRun = () => {
    // A lone point draws nothing with a plain stroke: give it a short horizontal tick.
    if (points === 1) d += 'h1';
    points = 0;
  };
  for (let k = 0; k < xs.length; k++) {
    const lo = lows[k];
    const hi = highs[k];
    if (lo === null || hi === null) {
      endRun();
      continue;
    }
    const x = tenth(xs[k]);
    const a = tenth(lo);
    const b = tenth(hi);
    d += points > 0 ? 'l' + num((x - px) / 10) + ' ' + num((a - py) / 10) : 'M' + num(x / 10) + ' ' + num(a / 10);
    points++;
    py = a;
    if (b !== a) {
      d += 'v' + num((b - a) / 10);
      py = b;
      points++;
    }
    px = x;
  }
  endRun();
  return d;
}

/**
 * Rectangles over the runs where `on(k)` holds: bucket k spans [x0s[k], x1s[k]]; the rectangles
 * span [top, bottom] vertically. One path for all of them.
 */
export function bandsPath(x0s: readonly number[], x1s: readonly number[], on: (k: number) => boolean, top: number, bottom: number): string {
  let d = '';
  let start = -1;
  const close = (endK: number) => {
    d += 'M' + num(x0s[start]) + ' ' + num(top) + 'H' + num(x1s[endK]) + 'V' + num(bottom) + 'H' + num(x0s[start]) + 'Z';
  };
  for (let k = 0; k < x0s.length; k++) {
    if (on(k)) {
      if (start < 0) start = k;
    } else if (start >= 0) {
      close(k - 1);
      start = -1;
    }
  }
  if (start >= 0) close(x0s.length - 1);
  return d;
}

/** Marker shapes centred on (x, y), size r: distinct shapes let builds be told apart without colour. */
export const MARKER_SHAPES = ['circle', 'square', 'triangle', 'diamond', 'triangleDown', 'cross'] as const;
export type MarkerShape = (typeof MARKER_SHAPES)[number];

export function markerPath(shape: MarkerShape, x: number, y: number, r: number): string {
  const p = (dx: number, dy: number) => num(x + dx) + ' ' + num(y + dy);
  switch (shape) {
    case 'circle':
      return `M${p(-r, 0)}A${num(r)} ${num(r)} 0 1 0 ${p(r, 0)}A${num(r)} ${num(r)} 0 1 0 ${p(-r, 0)}Z`;
    case 'square':
      return `M${p(-r * 0.85, -r * 0.85)}H${num(x + r * 0.85)}V${num(y + r * 0.85)}H${num(x - r * 0.85)}Z`;
    case 'triangle':
      return `M${p(0, -r * 1.1)}L${p(r, r * 0.8)}L${p(-r, r * 0.8)}Z`;
    case 'triangleDown':
      return `M${p(0, r * 1.1)}L${p(r, -r * 0.8)}L${p(-r, -r * 0.8)}Z`;
    case 'diamond':
      return `M${p(0, -r * 1.15)}L${p(r, 0)}L${p(0, r * 1.15)}L${p(-r, 0)}Z`;
    case 'cross': {
      const a = r * 0.35;
      return `M${p(-a, -r)}H${num(x + a)}V${num(y - a)}H${num(x + r)}V${num(y + a)}H${num(x + a)}V${num(y + r)}H${num(x - a)}V${num(y + a)}H${num(x - r)}V${num(y - a)}H${num(x - a)}Z`;
    }
  }
}
