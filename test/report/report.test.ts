import { existsSync, mkdirSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import Handlebars from 'handlebars';
import { beforeAll, describe, expect, it } from 'vitest';
import { renderReportHtml } from '../../harness/report/index.js';
import { runReportCommand } from '../../harness/commands/report.js';
import { buildReportModel } from '../../harness/report/model.js';
import { seriesPath } from '../../harness/score/series/file.js';
import type { RunSeries } from '../../harness/score/series/types.js';
import type { ResultsFile } from '../../harness/results/types.js';
import { HOSTILE_STDERR, HOSTILE_TITLE, smallRun } from './support.js';

let dir: string;
let results: ResultsFile;
let html: string;

beforeAll(async () => {
  ({ dir, results } = await smallRun());
  html = readFileSync(path.join(dir, 'report.html'), 'utf8');
});

const text = (markup: string) => markup.replace(/<[^>]*>/g, ' ');

describe('report from a small real run', () => {
  it('writes a series file for every run that ticked, without --trace', () => {
    for (const run of results.runs) {
      const file = path.join(dir, seriesPath(run.scenario.id, run.build));
      expect(existsSync(file)).toBe(run.metrics !== null);
    }
  });

  it('names every build and scenario in the verdict and the matrix', () => {
    const verdict = html.slice(html.indexOf('id="verdict"'), html.indexOf('id="overview"'));
    const matrix = html.slice(html.indexOf('id="matrix"'), html.indexOf('id="scenarios"'));
    for (const build of ['nominal', 'governed', 'broken']) {
      expect(text(verdict)).toContain(build);
      expect(text(matrix)).toContain(build);
    }
    for (const id of ['shaped-floor', 'hostile-title']) expect(text(matrix)).toContain(id);
  });

  it('lists the gate regressions with links to their scenario sections', () => {
    // The crashing build errors where the baseline passed: the gate breaks on status.
    const model = buildReportModel(results, { outDir: dir, baseline: 'nominal' });
    expect(model.gate.verdict).toBe('block');
    expect(model.gate.regressions.length).toBeGreaterThan(0);
    for (const r of model.gate.regressions) {
      expect(r.anchor).not.toBe('');
      expect(html).toContain(`href="#${r.anchor}"`);
      expect(html).toContain(`id="${r.anchor}"`);
    }
  });

  it('shows a hostile scenario title, material name and build stderr as text, never as markup', () => {
    const escaped = Handlebars.Utils.escapeExpression;
    expect(html).not.toContain(HOSTILE_TITLE);
    expect(html).toContain(escaped(HOSTILE_TITLE));
    expect(html).not.toContain('<img src=x');
    expect(html).toContain(escaped('<img src=x onerror=alert(3)>'));
    expect(html).not.toContain(HOSTILE_STDERR);
    expect(html).toContain(escaped(HOSTILE_STDERR));
    // The robot file's leg names (fixtures/hostile/robots) label the plots as text, in SVG too.
    expect(html).not.toContain('<svg onload');
    expect(html).toContain('&lt;svg onload=alert(6)&gt;');
    // Our one inline script is the only script element.
    expect(html.match(/<script/g)).toHaveLength(1);
  });

  it('labels feet by the robot file\'s leg names', () => {
    const start = html.indexOf('id="scenario-2-shaped-floor"');
    const section = html.slice(start, html.indexOf('id="bench"', start));
    for (const leg of ['FL', 'FR', 'HL', 'HR']) expect(section).toContain(`class="foot">${leg}<`);
    expect(html).not.toContain('class="foot">foot 0<');
  });

  it('draws the shaped floor: raster cells, a rectangle, a circle and a polygon patch', () => {
    const definition = html.match(/<g id="floor-\d+" shape-rendering="crispEdges">.*?<\/g>/gs) ?? [];
    const floor = definition.find((g) => g.includes('<circle')) ?? '';
    expect(floor).toMatch(/<circle cx="0.15" cy="0.2" r="0.12"/);
    expect(floor).toMatch(/<path d="M0.6 -0.4L0.9 -0.1L0.6 0.2Z"/);
    expect(floor).toMatch(/<rect x="0.3" y="-1" width="0.3" height="2"/);
    // 3 × 4 raster with alternating cells: no two neighbours in a column merge, 12 rects.
    expect((floor.match(/<rect /g) ?? []).length).toBe(12 + 1);
  });

  it('refers to nothing outside the file: no URL scheme, no external resource', () => {
    // The SVG namespace name in the script is an identifier, never fetched.
    expect(html.replaceAll('http://www.w3.org/2000/svg', '')).not.toMatch(/\b(?:https?|ftp|wss?):\/\//i);
    expect(html).not.toMatch(/\bsrc\s*=/i);
    expect(html).not.toMatch(/@import|@font-face/i);
    for (const m of html.matchAll(/url\(([^)]*)\)/g)) expect(m[1]).toMatch(/^#/);
    for (const m of html.matchAll(/href="([^"]*)"/g)) expect(m[1]).toMatch(/^(#|\.\.?\/)/);
  });

  it('carries the safety caution in the footer', () => {
    expect(text(html)).toMatch(/not proof that a controller is safe on\s+hardware/);
  });

  it('says "not measured" without bench data and shows the figures when given', () => {
    expect(text(html)).toContain('Not measured');
    const withBench = renderReportHtml(results, {
      outDir: dir,
      baseline: 'nominal',
      bench: { builds: [{ name: 'governed', governor: { updatesPerSecond: 2_500_000 }, ticksPerSecond: 90_000, realTimeFactor: 650 }] },
    });
    const bench = text(withBench.slice(withBench.indexOf('id="bench"'), withBench.indexOf('id="provenance"')));
    expect(bench).toContain('2\u2009500\u2009000');
    expect(bench).toContain('650');
    expect(bench).not.toContain('Not measured');
  });
});

describe('fields other parts of the harness may add', () => {
  it('plots every named telemetry scalar of a series, grouped by name prefix, names escaped', () => {
    const copy = mkdtempSync(path.join(tmpdir(), 'footing-telemetry-'));
    mkdirSync(path.join(copy, 'series'));
    for (const run of results.runs.filter((r) => r.metrics)) {
      const file = seriesPath(run.scenario.id, run.build);
      const series = JSON.parse(readFileSync(path.join(dir, file), 'utf8')) as RunSeries;
      const ramp = series.t_s.map((t) => t);
      // The series file's telemetry as the recorder writes it (score/series/types.ts TelemetrySeries).
      const entry = (name: string, values: number[]) => ({ name, values: { min: values, max: values }, min: 0, max: 1 });
      const telemetry = [
        entry('estimator.frictionEstimate', ramp),
        entry('estimator.contactForce_N', ramp),
        entry('<img src=x onerror=alert(7)>.x', ramp),
        entry('short.series', [1]), // wrong length: ignored
      ];
      writeFileSync(path.join(copy, file), JSON.stringify({ ...series, telemetry }));
    }
    const page = renderReportHtml(results, { outDir: copy, baseline: 'nominal' });
    const withSeries = results.runs.filter((r) => r.metrics).length;
    expect((page.match(/<svg class="plot telemetry"/g) ?? []).length).toBe(3 * withSeries);
    expect(page).toContain('data-name="estimator.contactForce_N (N)"');
    expect(page).not.toContain('<img src=x onerror=alert(7)>');
    expect(page).not.toContain('short.series');
  });

  it('shows stance and touchdown metrics in the matrix where a run carries them', () => {
    // The scorer's own rows (stance margin, slip per touchdown) and, from its touchdown group,
    // one mean per landing quantity; spreads stay in results.json.
    const matrix = text(html.slice(html.indexOf('id="matrix"'), html.indexOf('id="scenarios"')));
    expect(matrix).toContain('slip per touchdown');
    expect(matrix).toContain('touchdown impactPeakForce_N mean');
    expect(matrix).not.toContain('touchdown impactPeakForce_N max');
    expect(matrix).not.toContain('touchdown transient_s');
  });
});

describe('footing report (re-render from saved results)', () => {
  it('re-renders the same plots from the results folder and its series', async () => {
    const out = path.join(mkdtempSync(path.join(tmpdir(), 'footing-rerender-')), 'again.html');
    const outcome = await runReportCommand({ results: [dir], out, baseline: 'nominal' });
    expect(outcome.exitCode).toBe(1); // runs errored (the crashing build), as `footing merge` reports it
    const again = readFileSync(out, 'utf8');
    const plots = (page: string) => (page.match(/<svg class="plot [^"]+"/g) ?? []).length;
    expect(plots(again)).toBe(plots(html));
    expect(plots(again)).toBeGreaterThan(10);
    // The scenario's command change (trot at 0.3 s, shaped-floor.yaml) and its robot's leg names
    // come from the series files, which carry them: the re-render has no scenario to read.
    const marks = (page: string) => page.match(/<path class="event command"[^>]*>(<title>[^<]*<\/title>)?/g) ?? [];
    expect(marks(html).length).toBeGreaterThan(0);
    expect(marks(again)).toEqual(marks(html));
    expect(marks(again).join(' ')).toContain('command: trot, v = (0.5, 0) m/s');
    const legLabels = (page: string) => (page.match(/>FL</g) ?? []).length;
    expect(legLabels(again)).toBe(legLabels(html));
  });

  it('exits 2 naming the problem for a missing results folder, a bad file and an unknown baseline', async () => {
    const out = path.join(tmpdir(), 'never.html');
    const missing = await runReportCommand({ results: ['/nonexistent/results'], out });
    expect(missing.exitCode).toBe(2);
    expect(missing.lines.join('\n')).toContain('/nonexistent/results');
    const badDir = mkdtempSync(path.join(tmpdir(), 'footing-bad-'));
    writeFileSync(path.join(badDir, 'results.json'), '{"format": "something else"}');
    const bad = await runReportCommand({ results: [badDir], out });
    expect(bad.exitCode).toBe(2);
    expect(bad.lines.join('\n')).toContain('results.json');
    const unknown = await runReportCommand({ results: [dir], out, baseline: 'nobody' });
    expect(unknown.exitCode).toBe(2);
    expect(unknown.lines.join('\n')).toContain('nobody');
    const notHtml = await runReportCommand({ results: [dir], out: path.join(tmpdir(), 'x.txt') });
    expect(notHtml.exitCode).toBe(2);
  });

  it('keeps the file small: a 72-run suite of 8 s scenarios stays under 5 MB', () => {
    // This run's results copied 12 times over (48 runs with series), each series stretched to the
    // bounded maximum of buckets and given five times its footholds and slips, as an 8 s trot has.
    const big = mkdtempSync(path.join(tmpdir(), 'footing-big-'));
    mkdirSync(path.join(big, 'series'));
    const runs = [];
    for (let copy = 0; copy < 12; copy++) {
      for (const run of results.runs.filter((r) => r.metrics)) {
        const id = `${run.scenario.id}-${copy}`;
        runs.push({ ...run, scenario: { ...run.scenario, id } });
        const source = JSON.parse(readFileSync(path.join(dir, seriesPath(run.scenario.id, run.build)), 'utf8')) as RunSeries;
        writeFileSync(path.join(big, seriesPath(id, run.build)), JSON.stringify(stretch(source, id)));
      }
    }
    const page = renderReportHtml({ ...results, runs }, { outDir: big, baseline: 'nominal' });
    expect(runs.length).toBe(48);
    expect((page.length * 72) / 48).toBeLessThan(5_000_000);
  });
});

/** The series resampled to 1000 buckets (each value repeated), as a long run would store it. */
function stretch(s: RunSeries, id: string): RunSeries {
  const n = s.t_s.length;
  const factor = Math.max(1, Math.ceil(1000 / n));
  const rep = <T,>(a: T[]) => a.flatMap((v) => Array<T>(factor).fill(v));
  return {
    ...s,
    scenario: { ...s.scenario, id },
    t_s: s.t_s.flatMap((t, k) => Array.from({ length: factor }, (_, j) => (k === 0 ? 0 : s.t_s[k - 1]) + ((t - (k === 0 ? 0 : s.t_s[k - 1])) * (j + 1)) / factor)),
    bucketTicks: Math.max(1, Math.round(s.bucketTicks / factor)),
    feet: s.feet.map((f) => ({
      frictionUse: { min: rep(f.frictionUse.min), max: rep(f.frictionUse.max) },
      normalForce_N: { min: rep(f.normalForce_N.min), max: rep(f.normalForce_N.max) },
      stance: rep(f.stance),
      slipping: rep(f.slipping),
      slipDistance_m: rep(f.slipDistance_m),
    })),
    trunk: { x_m: rep(s.trunk.x_m), y_m: rep(s.trunk.y_m), referenceX_m: rep(s.trunk.referenceX_m), referenceY_m: rep(s.trunk.referenceY_m) },
    governor: s.governor.map((g) => ({ axis: g.axis, target: { min: rep(g.target.min), max: rep(g.target.max) }, applied: { min: rep(g.applied.min), max: rep(g.applied.max) } })),
    footholds: [0, 1, 2, 3, 4].flatMap((k) => s.footholds.map((f) => ({ ...f, x_m: f.x_m + 0.3 * k }))),
    slips: [0, 1, 2, 3, 4].flatMap((k) => s.slips.map((f) => ({ ...f, from_m: [f.from_m[0] + 0.3 * k, f.from_m[1]] as [number, number] }))),
  };
}
