// Replay overlays for the report: the recorded trunk path against the simulated one (top view,
// equal axes) and the distance between them over time with the replay's tolerance. Data in, SVG
// out, from numbers only (svg.ts).

import type { FidelityBlock } from '../../score/fidelity.js';
import { linePath } from './path.js';
import { GRID, INK, SLIP_COLOUR, type BuildStyle } from './palette.js';
import { linearScale, niceTicks } from './scale.js';
import { asSvg, label, num, type SvgMarkup } from './svg.js';

const WIDTH = 420;
const PATH_HEIGHT = 220;
const ERROR_HEIGHT = 120;
const PAD = 30;

/** Top view: recorded path dashed ink, simulated path in the build's colour. */
export function recordedPathPlot(f: FidelityBlock, style: BuildStyle): SvgMarkup {
  const all = [...f.overlay.recorded_m, ...f.overlay.simulated_m];
  if (all.length === 0) return asSvg('');
  let x0 = Math.min(...all.map((p) => p[0]));
  let x1 = Math.max(...all.map((p) => p[0]));
  let y0 = Math.min(...all.map((p) => p[1]));
  let y1 = Math.max(...all.map((p) => p[1]));
  // Equal scales on both axes, with a margin: a sideways drift must look as large as it is.
  const span = Math.max(x1 - x0, (y1 - y0) * ((WIDTH - 2 * PAD) / (PATH_HEIGHT - 2 * PAD)), 0.2) * 1.1;
  const cx = (x0 + x1) / 2;
  const cy = (y0 + y1) / 2;
  x0 = cx - span / 2;
  x1 = cx + span / 2;
  const ySpan = (span * (PATH_HEIGHT - 2 * PAD)) / (WIDTH - 2 * PAD);
  y0 = cy - ySpan / 2;
  y1 = cy + ySpan / 2;
  const sx = linearScale(x0, x1, PAD, WIDTH - PAD);
  const sy = linearScale(y0, y1, PATH_HEIGHT - PAD, PAD);
  const path = (points: [number, number][]) => linePath(points.map((p) => sx(p[0])), points.map((p) => sy(p[1])));
  let out = `<svg class="plot recorded-path" viewBox="0 0 ${WIDTH} ${PATH_HEIGHT}" width="${WIDTH}" height="${PATH_HEIGHT}" role="img">`;
  for (const t of niceTicks(x0, x1, 5)) out += `<path d="M${num(sx(t))} ${PAD}V${PATH_HEIGHT - PAD}" stroke="${GRID}"/><text x="${num(sx(t))}" y="${PATH_HEIGHT - PAD + 12}" text-anchor="middle">${label(t, 2)}</text>`;
  for (const t of niceTicks(y0, y1, 3)) out += `<path d="M${PAD} ${num(sy(t))}H${WIDTH - PAD}" stroke="${GRID}"/><text x="${PAD - 3}" y="${num(sy(t) + 3)}" text-anchor="end">${label(t, 2)}</text>`;
  out += `<path class="recorded" d="${path(f.overlay.recorded_m)}" fill="none" stroke="${INK}" stroke-width="1.4" stroke-dasharray="5 3"/>`;
  out += `<path class="simulated" d="${path(f.overlay.simulated_m)}" fill="none" stroke="${style.colour}" stroke-width="1.4"${style.dash ? ` stroke-dasharray="${style.dash}"` : ''}/>`;
  out += `<text x="${WIDTH - PAD}" y="${PATH_HEIGHT - 4}" text-anchor="end">x, m (y vertical, equal scale)</text></svg>`;
  return asSvg(out);
}

/** Distance between recorded and simulated trunk over time; the tolerance as a dashed line. */
export function recordedErrorPlot(f: FidelityBlock): SvgMarkup {
  const t = f.overlay.t_s;
  if (t.length === 0) return asSvg('');
  const error = f.overlay.recorded_m.map((r, k) => Math.hypot(r[0] - f.overlay.simulated_m[k][0], r[1] - f.overlay.simulated_m[k][1]));
  const tolerance = f.tolerances.trunkPosition_m;
  const top = Math.max(tolerance * 1.5, ...error);
  const sx = linearScale(0, Math.max(t[t.length - 1], 0.001), PAD, WIDTH - PAD);
  const sy = linearScale(0, top, ERROR_HEIGHT - PAD, 10);
  let out = `<svg class="plot recorded-error" viewBox="0 0 ${WIDTH} ${ERROR_HEIGHT}" width="${WIDTH}" height="${ERROR_HEIGHT}" role="img">`;
  for (const v of niceTicks(0, top, 3)) out += `<path d="M${PAD} ${num(sy(v))}H${WIDTH - PAD}" stroke="${GRID}"/><text x="${PAD - 3}" y="${num(sy(v) + 3)}" text-anchor="end">${label(v * 1000, 0)}</text>`;
  for (const v of niceTicks(0, t[t.length - 1], 5)) out += `<text x="${num(sx(v))}" y="${ERROR_HEIGHT - PAD + 12}" text-anchor="middle">${label(v, 1)}</text>`;
  out += `<path class="tolerance" d="M${PAD} ${num(sy(tolerance))}H${WIDTH - PAD}" stroke="${SLIP_COLOUR}" stroke-dasharray="4 2"/>`;
  out += `<path class="error" d="${linePath(t.map(sx), error.map(sy))}" fill="none" stroke="${INK}" stroke-width="1.2"/>`;
  out += `<text x="${WIDTH - PAD}" y="${ERROR_HEIGHT - 4}" text-anchor="end">t, s; horizontal trunk error, mm</text></svg>`;
  return asSvg(out);
}
