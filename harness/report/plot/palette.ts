// The report's visual language: build hues from the Okabe–Ito set (Okabe & Ito 2008, designed to
// stay distinguishable under the common colour-vision deficiencies), each paired with a marker
// shape and a dash pattern so no reading depends on colour alone; and a friction ramp from pale
// sand (grippy) to deep ink-blue (slippery), monotone in lightness so it reads in grey too.

import { MARKER_SHAPES, type MarkerShape } from './path.js';

/** Blue, orange, bluish green, reddish purple, sky blue, black, yellow (vermillion kept for slips). */
const BUILD_HUES = ['#0072B2', '#E69F00', '#009E73', '#CC79A7', '#56B4E9', '#1b1b1b', '#b59b00'];
const DASHES = ['', '7 3', '2 2.5', '9 3 2 3', '4 4', '1 3', '12 4'];

export const INK = '#1f2328';
export const SLIP_COLOUR = '#D55E00';
export const CONE_COLOUR = '#6b3d00';
export const STANCE_SHADE = '#e7e3da';
export const GRID = '#d9d6cf';

export interface BuildStyle {
  colour: string;
  shape: MarkerShape;
  dash: string;
}

export function buildStyle(index: number): BuildStyle {
  return {
    colour: BUILD_HUES[index % BUILD_HUES.length],
    shape: MARKER_SHAPES[index % MARKER_SHAPES.length],
    dash: DASHES[index % DASHES.length],
  };
}

/** Friction ramp stops (μs, colour); μs above the last stop takes its colour. */
export const MU_STOPS: [number, [number, number, number]][] = [
  [0, [22, 46, 74]],
  [0.15, [47, 92, 137]],
  [0.3, [96, 139, 178]],
  [0.5, [160, 190, 210]],
  [0.7, [212, 221, 219]],
  [1.0, [246, 240, 226]],
];

export function muColour(mu: number): string {
  const stops = MU_STOPS;
  if (!(mu > stops[0][0])) return rgb(stops[0][1]);
  for (let k = 1; k < stops.length; k++) {
    const [m1, c1] = stops[k];
    if (mu <= m1) {
      const [m0, c0] = stops[k - 1];
      const f = (mu - m0) / (m1 - m0);
      return rgb([c0[0] + f * (c1[0] - c0[0]), c0[1] + f * (c1[1] - c0[1]), c0[2] + f * (c1[2] - c0[2])]);
    }
  }
  return rgb(stops[stops.length - 1][1]);
}

function rgb(c: readonly number[]): string {
  const hex = (v: number) => Math.round(Math.max(0, Math.min(255, v))).toString(16).padStart(2, '0');
  return `#${hex(c[0])}${hex(c[1])}${hex(c[2])}`;
}
