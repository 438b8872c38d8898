// The suite overview's small plots: one row per scenario, one marker per build (friction margin
// and slip dots on shared axes), and the build swatches of the legend.

import { markerPath } from './path.js';
import { CONE_COLOUR, GRID, INK, type BuildStyle } from './palette.js';
import { linearScale } from './scale.js';
import { asSvg, label, num, type SvgMarkup } from './svg.js';
export interface DotValue {
  value: number | null;
  style: BuildStyle;
  /** The run passed its acceptance: filled marker; failed or errored: hollow (shape, not colour alone). */
  passed: boolean;
}

export const OVERVIEW_WIDTH = 220;
/** Each build has its own lane, so equal values never hide one marker behind another. */
const LANE_PX = 9;
const LANE_TOP = 6;
const MARKER_R = 3.6;

function lanesHeight(lanes: number): number {
  return LANE_TOP * 2 + Math.max(0, lanes - 1) * LANE_PX;
}

function marker(v: DotValue, x: number, lane: number): string {
  const d = markerPath(v.style.shape, x, LANE_TOP + lane * LANE_PX, MARKER_R);
  return v.passed
    ? `<path class="dot pass" d="${d}" fill="${v.style.colour}" stroke="#fff" stroke-width="0.8"/>`
    : `<path class="dot fail" d="${d}" fill="#fff" stroke="${v.style.colour}" stroke-width="1.6"/>`;
}

/**
 * Friction margin min of every build (one lane each, in build order) from MARGIN_AXIS[0] to [1],
 * the cone (0) marked and the far side shaded. The axis is cut where the interesting values are (a
 * walking robot's worst margin sits in −0.25 … 0.5); values beyond sit at the edge with an arrow.
 */
export const MARGIN_AXIS: [number, number] = [-0.25, 0.5];
export function marginDots(values: DotValue[]): SvgMarkup {
  const x = linearScale(MARGIN_AXIS[0], MARGIN_AXIS[1], 8, OVERVIEW_WIDTH - 8);
  const h = lanesHeight(values.length);
  let out = `<svg class="dots margin" viewBox="0 0 ${OVERVIEW_WIDTH} ${h}" width="${OVERVIEW_WIDTH}" height="${h}" role="img">`;
  const [lo, hi] = MARGIN_AXIS;
  out += `<rect x="${num(x(lo))}" y="1" width="${num(x(0) - x(lo))}" height="${h - 2}" fill="#f6dccb"/>`;
  for (const t of [-0.2, -0.1, 0.1, 0.2, 0.3, 0.4, 0.5]) out += `<path d="M${num(x(t))} 1V${h - 1}" stroke="${GRID}" stroke-width="0.6"/>`;
  out += `<path d="M${num(x(0))} 0V${h}" stroke="${CONE_COLOUR}" stroke-dasharray="2 1.5"/>`;
  values.forEach((v, lane) => {
    if (v.value === null) return;
    const at = x(Math.max(lo, Math.min(hi, v.value)));
    out += marker(v, at, lane);
    if (v.value < lo || v.value > hi) out += `<text x="${num(v.value < lo ? at + 6 : at - 6)}" y="${num(LANE_TOP + lane * LANE_PX + 3)}" text-anchor="${v.value < lo ? 'start' : 'end'}">${v.value < lo ? '◂' : '▸'}</text>`;
  });
  return asSvg(out + '</svg>');
}

/** Slip distance of every build (one lane each) on a log axis from 1 mm to 1 m (beyond: at the edges). */
export function slipDots(values: DotValue[]): SvgMarkup {
  const x = linearScale(-3, 0, 8, OVERVIEW_WIDTH - 8);
  const at = (m: number) => x(Math.max(-3, Math.min(0, Math.log10(Math.max(m, 1e-3)))));
  const h = lanesHeight(values.length);
  let out = `<svg class="dots slip" viewBox="0 0 ${OVERVIEW_WIDTH} ${h}" width="${OVERVIEW_WIDTH}" height="${h}" role="img">`;
  for (const t of [-3, -2, -1, 0]) out += `<path d="M${num(x(t))} 1V${h - 1}" stroke="${GRID}" stroke-width="0.6"/>`;
  values.forEach((v, lane) => {
    if (v.value !== null) out += marker(v, at(v.value), lane);
  });
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
