// One trend line as inline SVG: nights evenly spaced left to right (commit and date on the axis),
// failing nights shaded, the gate's line against the first night dashed, change points as
// vertical rules between the two nights they separate, scenario revisions as dotted rules.
// Markup from numbers (report/plot helpers); the only text is escapeXml'd dates and commits.

import { linePath, markerPath } from '../report/plot/path.js';
import { GRID, INK, SLIP_COLOUR, type BuildStyle } from '../report/plot/palette.js';
import { linearScale, niceTicks } from '../report/plot/scale.js';
import { asSvg, escapeXml, label, num, type SvgMarkup } from '../report/plot/svg.js';
import type { ChangePoint } from './changePoint.js';
import type { GateLimit } from './limits.js';
import type { TrendPoint } from './types.js';

export const TREND_WIDTH = 640;
export const TREND_HEIGHT = 190;
const LEFT = 52;
const RIGHT = 12;
const TOP = 10;
const BOTTOM = 44;
const FAIL_SHADE = '#f3d3d3';
const LIMIT_COLOUR = '#b03030';
const CHANGE_COLOUR = '#6a3d9a';

export const shortCommit = (commit: string | null): string => (commit === null ? '—' : commit.slice(0, 8));
export const nightDate = (startedAt: string): string => startedAt.slice(0, 10);

export function trendPlot(points: readonly TrendPoint[], style: BuildStyle, options: { limit: GateLimit | null; changes: readonly ChangePoint[]; decimals: number }): SvgMarkup {
  const values = points.map((p) => p.value).filter((v): v is number => v !== null);
  const { limit, changes, decimals } = options;
  let lo = Math.min(...values, ...(limit ? [limit.value] : []));
  let hi = Math.max(...values, ...(limit ? [limit.value] : []));
  if (!(hi > lo)) {
    const pad = Math.abs(lo) > 0 ? Math.abs(lo) * 0.1 : 1;
    lo -= pad;
    hi += pad;
  }
  const n = points.length;
  const x = linearScale(0, Math.max(1, n - 1), LEFT + 6, TREND_WIDTH - RIGHT - 6);
  const y = linearScale(lo, hi, TREND_HEIGHT - BOTTOM, TOP);
  const half = n > 1 ? (x(1) - x(0)) / 2 : 6;
  const parts: string[] = [];
  parts.push(`<svg class="trend" viewBox="0 0 ${TREND_WIDTH} ${TREND_HEIGHT}" width="${TREND_WIDTH}" height="${TREND_HEIGHT}" role="img">`);
  // Failing nights (status fail or error) as shaded columns: the pass/fail band.
  points.forEach((p, k) => {
    if (p.status !== 'pass') parts.push(`<rect class="failing" x="${num(x(k) - half)}" y="${TOP}" width="${num(2 * half)}" height="${TREND_HEIGHT - BOTTOM - TOP}" fill="${FAIL_SHADE}"/>`);
  });
  for (const tick of niceTicks(lo, hi, 4)) {
    parts.push(`<path d="M${LEFT} ${num(y(tick))}H${TREND_WIDTH - RIGHT}" stroke="${GRID}" stroke-width="0.6"/>`);
    parts.push(`<text x="${LEFT - 4}" y="${num(y(tick) + 3.5)}" text-anchor="end" font-size="10">${escapeXml(label(tick, decimals + 1))}</text>`);
  }
  // Scenario revisions: the values on either side are not comparable.
  for (let k = 1; k < n; k++) {
    if (points[k].scenarioHash !== points[k - 1].scenarioHash) {
      parts.push(`<path class="revision" d="M${num(x(k) - half)} ${TOP}V${TREND_HEIGHT - BOTTOM}" stroke="${INK}" stroke-dasharray="1 3"/>`);
    }
  }
  if (limit) {
    parts.push(`<path class="limit" d="M${LEFT} ${num(y(limit.value))}H${TREND_WIDTH - RIGHT}" stroke="${LIMIT_COLOUR}" stroke-dasharray="6 3" stroke-width="1.2"><title>${escapeXml(`gate line against the first night: ${limit.rule} → ${label(limit.value, decimals + 2)}`)}</title></path>`);
  }
  for (const change of changes) {
    const cx = (x(change.before) + x(change.after)) / 2;
    parts.push(`<path class="change" d="M${num(cx)} ${TOP}V${TREND_HEIGHT - BOTTOM}" stroke="${CHANGE_COLOUR}" stroke-width="2"><title>${escapeXml(`change point between ${nightDate(points[change.before].startedAt)} (${shortCommit(points[change.before].commit)}) and ${nightDate(points[change.after].startedAt)} (${shortCommit(points[change.after].commit)}), Pettitt p = ${change.p.toExponential(2)}`)}</title></path>`);
  }
  const xs = points.map((_, k) => x(k));
  const ys = points.map((p) => (p.value === null ? null : y(p.value)));
  parts.push(`<path class="series" d="${linePath(xs, ys)}" fill="none" stroke="${style.colour}" stroke-width="1.5"${style.dash ? ` stroke-dasharray="${style.dash}"` : ''}/>`);
  if (n <= 120) {
    points.forEach((p, k) => {
      if (p.value === null) return;
      parts.push(`<path class="night" d="${markerPath(style.shape, xs[k], ys[k] as number, 2.6)}" fill="${p.status === 'pass' ? style.colour : SLIP_COLOUR}"><title>${escapeXml(`${nightDate(p.startedAt)} ${shortCommit(p.commit)}: ${label(p.value, decimals + 2)} (${p.status})`)}</title></path>`);
    });
  }
  // Axis: about six labelled nights, date over commit.
  const every = Math.max(1, Math.ceil(n / 6));
  for (let k = 0; k < n; k += every) {
    parts.push(`<text x="${num(xs[k])}" y="${TREND_HEIGHT - BOTTOM + 14}" text-anchor="middle" font-size="10">${escapeXml(nightDate(points[k].startedAt))}</text>`);
    parts.push(`<text x="${num(xs[k])}" y="${TREND_HEIGHT - BOTTOM + 26}" text-anchor="middle" font-size="9" font-family="monospace">${escapeXml(shortCommit(points[k].commit))}</text>`);
  }
  parts.push(`<path d="M${LEFT} ${TREND_HEIGHT - BOTTOM}H${TREND_WIDTH - RIGHT}" stroke="${INK}" stroke-width="0.8"/>`);
  parts.push('</svg>');
  return asSvg(parts.join(''));
}
