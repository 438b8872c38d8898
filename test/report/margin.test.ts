// The "Margin to failure" and "Families" sections: drawn from hand-written margin searches and
// family scores laid onto a small real run (validated against the results schema), absent for a
// results file without them, and hostile text stays text.
import Handlebars from 'handlebars';
import { beforeAll, describe, expect, it } from 'vitest';
import { wilsonInterval } from '../../harness/score/proportion.js';
import { renderReportHtml } from '../../harness/report/index.js';
import { buildReportModel } from '../../harness/report/model.js';
import { STRIP_WIDTH, INTERVAL_WIDTH } from '../../harness/report/plot/margin.js';
import { num } from '../../harness/report/plot/svg.js';
import type { ResultsFile } from '../../harness/results/types.js';
import { HOSTILE_FAMILY, HOSTILE_REASON, withMarginData } from './margin-support.js';
import { HOSTILE_TITLE, smallRun } from './support.js';

const escaped = Handlebars.Utils.escapeExpression;

let dir: string;
let plain: ResultsFile;
let withMargin: ResultsFile;
let plainHtml: string;
let html: string;

beforeAll(async () => {
  ({ dir, results: plain } = await smallRun());
  withMargin = withMarginData(plain);
  const options = { outDir: dir, baseline: 'nominal', generatedAt: new Date('2026-01-01T00:00:00Z') };
  plainHtml = renderReportHtml(plain, options);
  html = renderReportHtml(withMargin, options);
});

const section = (markup: string, id: string) => {
  const start = markup.indexOf(`<section id="${id}"`);
  return start < 0 ? '' : markup.slice(start, markup.indexOf('</section>', start));
};
const strips = (markup: string) => markup.match(/<svg class="strip".*?<\/svg>/gs) ?? [];

describe('margin to failure in the report', () => {
  it('renders no margin or families section, nor their links, for results without margin data', () => {
    expect(plainHtml).not.toContain('id="margin"');
    expect(plainHtml).not.toContain('id="families"');
    expect(plainHtml).not.toContain('href="#margin"');
    expect(plainHtml).not.toContain('Margin to failure');
    const model = buildReportModel(plain, { outDir: dir });
    expect(model.margin).toBeNull();
    expect(model.families).toBeNull();
  });

  it('draws one strip per search and one mark per sample, a disc for a pass and an × for a fail', () => {
    const margin = section(html, 'margin');
    expect(margin).not.toBe('');
    const searches = withMargin.runs.flatMap((r) => [r.margin?.friction, r.margin?.push].filter((s) => s !== null && s !== undefined));
    const drawn = strips(margin);
    expect(drawn).toHaveLength(searches.length);
    const all = searches.flatMap((s) => s!.samples);
    expect(margin.match(/class="probe /g) ?? []).toHaveLength(all.length);
    for (const status of ['pass', 'fail', 'error'] as const) {
      expect(margin.match(new RegExp(`class="probe probe-${status}"`, 'g')) ?? [], status).toHaveLength(all.filter((s) => s.status === status).length);
    }
    // Shape, not colour alone: a pass is a circle (arc commands), a fail two crossing strokes, unfilled.
    expect(margin).toMatch(/class="probe probe-pass" d="M[^"]*A[^"]*"/);
    expect(margin).toMatch(/class="probe probe-fail" d="M[^"A]*" fill="none"/);
  });

  it('marks the critical scale where the search put it on the shared axis', () => {
    // Strips of one scenario share an axis 0 … 1.04 × the widest range end (friction here ends at 1,
    // push at 3), with 12 px margins: x = 12 + s / max × (width − 24).
    const model = buildReportModel(withMargin, { outDir: dir, baseline: 'nominal' });
    const floor = model.margin!.scenarios.find((s) => s.id === 'shaped-floor')!;
    const x = 12 + (0.64375 / 1.04) * (STRIP_WIDTH - 24);
    expect(floor.friction[0].strip).toContain(`class="critical" d="M${num(x)} 0V`);
    const pushStrip = floor.push.find((p) => p.build === 'governed')!.strip!;
    expect(pushStrip).toContain(`class="critical" d="M${num(12 + (2 / (3 * 1.04)) * (STRIP_WIDTH - 24))} 0V`);
    // The nominal build has no push search: its row names the note instead of a strip.
    expect(floor.push.find((p) => p.build === 'nominal')!.strip).toBeNull();
  });

  it('sets critical friction and push, with μs and newtons, side by side across builds', () => {
    const table = html.slice(html.indexOf('<table class="critical-values"'), html.indexOf('</table>', html.indexOf('<table class="critical-values"')));
    // 0.64375 × μs 0.4 = 0.2575; push ×2 of an 80 N peak = 160 N.
    expect(table).toContain('× 0.644 (μs 0.258)');
    expect(table).toContain('× 2 (160 N)');
    expect(table).toContain('none: fails at every scale up to × 3');
    // Three builds, two columns each.
    expect(table.match(/<th scope="col" data-build="\d">critical friction/g)).toHaveLength(3);
  });

  it('writes ≤ / ≥ for a build that passes the whole range searched', () => {
    const copy = structuredClone(withMargin) as ResultsFile;
    const run = copy.runs.find((r) => r.scenario.id === 'shaped-floor' && r.build === 'governed')!;
    // Friction passes down to the range's low end (critical = range[0]); push survives its high end (range[1]).
    Object.assign(run.margin!.friction!, { outcome: 'passesWholeRange', criticalScale: 0.05, bracket: null, criticalStaticFriction: 0.02 });
    Object.assign(run.margin!.push!, { outcome: 'passesWholeRange', criticalScale: 3, bracket: null, criticalPeakForce_N: 240 });
    const model = buildReportModel(copy, { outDir: dir, baseline: 'nominal' });
    const cell = model.margin!.scenarios.find((s) => s.id === 'shaped-floor')!.row.find((c) => c?.build === 'governed')!;
    expect(cell.friction).toBe('≤ × 0.05 (μs 0.02)');
    expect(cell.push).toBe('≥ × 3 (240 N)');
  });

  it('flags a non-monotone boundary in text with its samples in scale order', () => {
    const margin = section(html, 'margin');
    expect(margin).toContain('1 search found a pass/fail boundary that is not monotone');
    expect(margin).toContain('boundary not monotone — samples in scale order: fail × 0.05, pass × 0.3, fail × 0.35, pass × 0.4, pass × 1');
  });

  it('shows each family per build with its Wilson interval as a bar', () => {
    const families = section(html, 'families');
    expect(families).not.toBe('');
    // Wilson 95 % for 7/10: 0.397 … 0.892 (worked by hand from Wilson 1927's formula with z = 1.96).
    const w = wilsonInterval(7, 10, 0.95);
    expect(w.lower).toBeCloseTo(0.3968, 3);
    expect(w.upper).toBeCloseTo(0.8922, 3);
    expect(families).toContain('7/10 (70 %)');
    expect(families).toContain('95 % Wilson 40 – 89 %');
    expect(families).toContain('10/10 (100 %)');
    const x = (v: number) => num(12 + v * (INTERVAL_WIDTH - 24));
    expect(families).toContain(`class="ci" d="M${x(w.lower)} 9H${x(w.upper)}`);
    expect(families.match(/<svg class="interval"/g)).toHaveLength(2);
  });

  it('keeps hostile titles, family ids and probe reasons as text, in HTML and inside SVG titles', () => {
    expect(html).not.toContain(HOSTILE_TITLE);
    expect(section(html, 'margin')).toContain(escaped(HOSTILE_TITLE));
    expect(html).not.toContain(HOSTILE_FAMILY);
    expect(section(html, 'families')).toContain(escaped(HOSTILE_FAMILY));
    expect(html).not.toContain(HOSTILE_REASON);
    expect(section(html, 'margin')).toContain('slip &lt;script&gt;alert(5)&lt;/script&gt; &amp; more');
    expect(html.match(/<script/g)).toHaveLength(1);
  });
});
