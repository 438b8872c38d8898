// Plots of the margin search and family scores (docs/margin.md, "For the report"): a strip of the
// probed scales as pass/fail marks with the critical scale and its bracket, and an interval bar of
// a family's success rate. Numbers in, SVG out; the only text inside is ours or passes escapeXml
// (the marks' hover titles quote the acceptance sentences of a failing probe).

import type { MarginSample, MarginSearchRecord } from '../../results/margin.js';
import { markerPath } from './path.js';
import { GRID, INK, type BuildStyle } from './palette.js';
import { linearScale, niceTicks } from './scale.js';
import { asSvg, escapeXml, label, num, type SvgMarkup } from './svg.js';

export const STRIP_WIDTH = 360;
const STRIP_HEIGHT = 38;
const LEFT = 12;
const RIGHT = 12;
const MID = 13;
const MARK_R = 4.2;

/** Mark colours: Okabe–Ito bluish green (pass), vermillion (fail), reddish purple (error). */
const STATUS_COLOUR = { pass: '#009E73', fail: '#D55E00', error: '#CC79A7' } as const;

/**
 * Shape by status so the strip reads without colour: a filled disc passes, an × fails, a hollow
 * square is an error run. Each mark is one <path class="probe probe-STATUS">.
 */
function probeMark(sample: MarginSample, x: number, y: number, what: string): string {
  const title = `<title>${escapeXml(probeTitle(sample, what))}</title>`;
  const c = STATUS_COLOUR[sample.status];
  if (sample.status === 'pass') return `<path class="probe probe-pass" d="${markerPath('circle', x, y, MARK_R)}" fill="${c}" fill-opacity="0.85" stroke="#fff" stroke-width="0.7">${title}</path>`;
  if (sample.status === 'fail') {
    const r = MARK_R * 0.95;
    const d = `M${num(x - r)} ${num(y - r)}L${num(x + r)} ${num(y + r)}M${num(x - r)} ${num(y + r)}L${num(x + r)} ${num(y - r)}`;
    return `<path class="probe probe-fail" d="${d}" fill="none" stroke="${c}" stroke-width="2">${title}</path>`;
  }
  return `<path class="probe probe-error" d="${markerPath('square', x, y, MARK_R)}" fill="#fff" stroke="${c}" stroke-width="1.6">${title}</path>`;
}

function probeTitle(s: MarginSample, what: string): string {
  const parts = [`${what} × ${label(s.scale, 4)}: ${s.status} (${s.role})`];
  if (s.slipDistance_m !== null) parts.push(`slip ${label(s.slipDistance_m * 1000, 1)} mm`);
  if (s.frictionMarginMin !== null) parts.push(`margin min ${label(s.frictionMarginMin, 3)}`);
  if (s.fell) parts.push('fell');
  return parts.join(', ') + (s.reasons.length > 0 ? `\n${s.reasons.join('\n')}` : '');
}

/**
 * One build's search on a shared axis 0 … axisMax: the bracket shaded, a solid line at the critical
 * scale, a dotted tick at ×1 (the scenario as written), one mark per sample.
 */
export function boundaryStrip(search: MarginSearchRecord, axisMax: number, style: BuildStyle, what: 'friction' | 'push'): SvgMarkup {
  const x = linearScale(0, axisMax, LEFT, STRIP_WIDTH - RIGHT);
  let out = `<svg class="strip" viewBox="0 0 ${STRIP_WIDTH} ${STRIP_HEIGHT}" width="${STRIP_WIDTH}" height="${STRIP_HEIGHT}" role="img" aria-label="${what} scale probes">`;
  out += `<path d="M${num(x(search.range[0]))} ${MID}H${num(x(search.range[1]))}" stroke="${GRID}" stroke-width="7" stroke-linecap="butt"/>`;
  if (search.bracket) {
    const a = x(Math.min(search.bracket.failing, search.bracket.passing));
    const b = x(Math.max(search.bracket.failing, search.bracket.passing));
    out += `<rect class="bracket" x="${num(a - 1)}" y="2" width="${num(Math.max(2, b - a + 2))}" height="${MID * 2 - 4}" fill="${style.colour}" fill-opacity="0.25"/>`;
  }
  out += `<path d="M${num(x(1))} 1V${MID * 2 - 1}" stroke="${INK}" stroke-width="0.8" stroke-dasharray="1.5 1.5"/>`;
  if (search.criticalScale !== null) {
    out += `<path class="critical" d="M${num(x(search.criticalScale))} 0V${MID * 2}" stroke="${INK}" stroke-width="1.6"/>`;
  }
  // Draw passes first so a fail next to the boundary stays on top.
  const ordered = [...search.samples].sort((p, q) => (p.status === 'pass' ? 0 : 1) - (q.status === 'pass' ? 0 : 1));
  for (const s of ordered) out += probeMark(s, x(s.scale), MID, what);
  out += `<g class="axis">`;
  for (const t of niceTicks(0, axisMax, 6)) {
    out += `<path d="M${num(x(t))} ${MID * 2}v3" stroke="${INK}"/><text x="${num(x(t))}" y="${STRIP_HEIGHT - 1}" text-anchor="middle">${label(t, 2)}</text>`;
  }
  return asSvg(out + `</g></svg>`);
}

/** Upper end of a shared strip axis: the widest searched range, at least ×1, a little headroom. */
export function stripAxisMax(searches: readonly MarginSearchRecord[]): number {
  let hi = 1;
  for (const s of searches) {
    hi = Math.max(hi, s.range[1]);
    for (const p of s.samples) hi = Math.max(hi, p.scale);
  }
  return hi * 1.04;
}

/** The three legend marks, for the section's key. */
export function probeLegend(status: 'pass' | 'fail' | 'error'): SvgMarkup {
  const sample: MarginSample = { scale: 0, status, role: 'nominal', slipDistance_m: null, frictionMarginMin: null, fell: null, reasons: [] };
  const mark = probeMark(sample, 7, 7, 'legend').replace(/<title>.*?<\/title>/s, '').replace('class="probe ', 'class="key ');
  return asSvg(`<svg class="swatch" viewBox="0 0 14 14" width="14" height="14" aria-hidden="true">${mark}</svg>`);
}

export const INTERVAL_WIDTH = 300;
const INTERVAL_HEIGHT = 26;

/**
 * A success rate on 0 … 100 %: an error bar from the interval's lower to upper end (with end
 * caps) and the build's marker at the rate.
 */
export function intervalBar(rate: number, lower: number, upper: number, style: BuildStyle): SvgMarkup {
  const x = linearScale(0, 1, LEFT, INTERVAL_WIDTH - RIGHT);
  const y = 9;
  let out = `<svg class="interval" viewBox="0 0 ${INTERVAL_WIDTH} ${INTERVAL_HEIGHT}" width="${INTERVAL_WIDTH}" height="${INTERVAL_HEIGHT}" role="img" aria-label="success rate with interval">`;
  out += `<path d="M${num(x(0))} ${y}H${num(x(1))}" stroke="${GRID}" stroke-width="1"/>`;
  const a = x(Math.max(0, Math.min(1, lower)));
  const b = x(Math.max(0, Math.min(1, upper)));
  out += `<path class="ci" d="M${num(a)} ${y}H${num(b)}M${num(a)} ${y - 5}V${y + 5}M${num(b)} ${y - 5}V${y + 5}" stroke="${style.colour}" stroke-width="2" fill="none"/>`;
  out += `<path class="rate" d="${markerPath(style.shape, x(Math.max(0, Math.min(1, rate))), y, 4.6)}" fill="${style.colour}" stroke="#fff" stroke-width="0.8"/>`;
  out += `<g class="axis">`;
  for (const t of [0, 0.25, 0.5, 0.75, 1]) {
    out += `<path d="M${num(x(t))} ${y + 6}v3" stroke="${INK}"/><text x="${num(x(t))}" y="${INTERVAL_HEIGHT - 1}" text-anchor="middle">${label(t * 100, 0)} %</text>`;
  }
  return asSvg(out + `</g></svg>`);
}
