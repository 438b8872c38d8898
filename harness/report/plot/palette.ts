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

/** The baseline's style in every report: neutral grey, solid line, square marker. */
export const BASELINE_STYLE: BuildStyle = { colour: '#6f6f6f', shape: 'square', dash: '' };

/**
 * A build's style from its name alone (FNV-1a 32-bit hash, Fowler–Noll–Vo), so a build looks the
 * same in every report whatever the build order; the baseline always takes BASELINE_STYLE. Hue,
 * marker and dash come from different digits of the hash, so two names sharing a hue almost
 * always differ in marker (7 hues × 5 markers × 7 dashes; the square stays the baseline's).
 */
export function buildStyle(name: string, isBaseline = false): BuildStyle {
  if (isBaseline) return BASELINE_STYLE;
  const h = fnv1a(name);
  const shapes = MARKER_SHAPES.filter((s) => s !== BASELINE_STYLE.shape);
  return {
    colour: BUILD_HUES[h % BUILD_HUES.length],
    shape: shapes[Math.floor(h / BUILD_HUES.length) % shapes.length],
    dash: DASHES[1 + (Math.floor(h / (BUILD_HUES.length * shapes.length)) % (DASHES.length - 1))],
  };
}

function fnv1a(text: string): number {
  let h = 0x811c9dc5;
  for (let k = 0; k < text.length; k++) {
    h ^= text.charCodeAt(k);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h;
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
