// The suite overview's small plots: one row per scenario, one marker per build (friction margin
// and slip dots on shared axes), and the build swatches of the legend.

import { markerPath } from './path.js';
import { CONE_COLOUR, GRID, INK, type BuildStyle } from './palette.js';
import { linearScale } from './scale.js';
import { asSvg, label, num, type SvgMarkup } from './svg.js';
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
