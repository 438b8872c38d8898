// The report of the bundled run (what `npm start` writes: the bundled scenarios × the four
// reference builds, gated against governed) read as an engineer reads it, in Debian's chromium:
// the roll-up in the first screen, build identity, overview markers, the shared time window,
// take-away files, narrow screens, print, and the page with scripts blocked. One browser for
// the file; the run itself takes about 10 s on two cores.
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { chromium, type Browser, type Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runSuite } from '../../harness/commands/run.js';
import { DEFAULT_BUILDS } from '../../harness/builds/spec.js';
import { renderReportHtml } from '../../harness/report/index.js';
import { PLOT_BUCKETS } from '../../harness/report/plot/timeSeries.js';
import type { ResultsFile } from '../../harness/results/types.js';
import { groupRanges, mergeGroups } from '../../harness/score/series/buckets.js';
import { seriesPath } from '../../harness/score/series/file.js';
import type { RunSeries } from '../../harness/score/series/types.js';

const CHROMIUM = '/usr/bin/chromium';
const BASELINE = 'governed';
/**
 * Bytes per run of the bundled run's report before this layout (roll-up, lanes, time window,
 * take-away): 3,279,625 B for 88 runs, measured on 2026-12-02 with `npm start`. The issue allows
 * at most 25 % more for the same data.
 */
const BYTES_PER_RUN_BEFORE = 3_279_625 / 88;
/**
 * Data the bundled runs gained since that figure, in this layout (telemetry plots left out as
 * below): revision 4 of ramp-stand-near-limit walks where revision 3 stood, and its section of
 * the report grew from 104,777 B to 162,157 B (measured on 2026-12-02 with `npm start` on both
 * revisions). New data is not layout growth, so it is taken off before the 25 % rule.
 */
const BYTES_OF_DATA_ADDED_SINCE = 162_157 - 104_777;

describe.skipIf(!existsSync(CHROMIUM))('the bundled run in headless chromium', () => {
  let browser: Browser;
  let page: Page;
  let dir: string;
  let results: ResultsFile;
  let url: string;
  let html: string;
  const consoleErrors: string[] = [];
  const requests: string[] = [];

  beforeAll(async () => {
    dir = mkdtempSync(path.join(tmpdir(), 'footing-bundled-'));
    const outcome = await runSuite({ paths: ['scenarios'], builds: [...DEFAULT_BUILDS], outDir: dir, jobs: 2, quiet: true, baseline: BASELINE });
    if (!outcome.results) throw new Error(`bundled run failed: ${outcome.lines.join('\n')}`);
    results = outcome.results;
    html = readFileSync(path.join(dir, 'report.html'), 'utf8');
    url = pathToFileURL(path.join(dir, 'report.html')).href;
    browser = await chromium.launch({ executablePath: CHROMIUM, headless: true, args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--no-first-run', '--disable-sync'] });
    page = await newPage(url, { width: 1400, height: 900 });
  }, 120_000);

  afterAll(async () => {
    await browser?.close();
  });

  async function newPage(address: string, viewport: { width: number; height: number }, javaScriptEnabled = true): Promise<Page> {
    const context = await browser.newContext({ viewport, javaScriptEnabled, acceptDownloads: true });
    const p = await context.newPage();
    p.on('console', (message) => {
      if (message.type() === 'error') consoleErrors.push(message.text());
    });
    p.on('pageerror', (error) => consoleErrors.push(String(error)));
    p.on('dialog', (dialog) => {
      consoleErrors.push(`dialog: ${dialog.message()}`);
      void dialog.dismiss();
    });
    p.on('request', (request) => requests.push(request.url()));
    await p.goto(address, { waitUntil: 'load' });
    return p;
  }

  /** Independently of the gate: runs the baseline passed and the build did not, per build. */
  function newFailuresFromResults(): Map<string, number> {
    const base = new Map(results.runs.filter((r) => r.build === BASELINE).map((r) => [r.scenario.id, r.status]));
    const counts = new Map<string, number>();
    for (const r of results.runs) {
      if (r.build === BASELINE) continue;
      const was = base.get(r.scenario.id);
      counts.set(r.build, (counts.get(r.build) ?? 0) + (was === 'pass' && r.status !== 'pass' ? 1 : 0));
    }
    return counts;
  }

  it('shows the roll-up within the first 1,000 px at 1400 × 900, and it names the build with the most new failures', async () => {
    const box = await page.locator('table.rollup').boundingBox();
    expect(box).not.toBeNull();
    expect((box?.y ?? Infinity) + (box?.height ?? 0)).toBeLessThanOrEqual(1000);
    const rows = await page.locator('table.rollup tbody tr').evaluateAll((trs) =>
      trs.map((tr) => ({ build: tr.getAttribute('data-build-name') ?? '', newFailures: Number(tr.querySelector('td.new-failures')?.textContent) })),
    );
    const expected = newFailuresFromResults();
    expect(new Map(rows.map((r) => [r.build, r.newFailures]))).toEqual(expected);
    const most = rows.reduce((a, b) => (b.newFailures > a.newFailures ? b : a));
    const expectedMost = [...expected.entries()].reduce((a, b) => (b[1] > a[1] ? b : a))[0];
    expect(most.build).toBe(expectedMost);
    expect(await page.locator('.most-new-failures').innerText()).toBe(expectedMost);
    // Still failing + fixed + new failures never exceed the scenarios compared.
    const scenarios = new Set(results.runs.map((r) => r.scenario.id)).size;
    for (const r of rows) expect(r.newFailures).toBeLessThanOrEqual(scenarios);
  });

  it('groups the regressions by scenario, collapsed, with the worst change in each header', async () => {
    const groups = page.locator('details.reg-group');
    const broken = new Set(results.runs.map((r) => r.scenario.id));
    expect(await groups.count()).toBeGreaterThan(0);
    expect(await groups.count()).toBeLessThanOrEqual(broken.size);
    expect(await groups.evaluateAll((ds) => ds.every((d) => !(d as HTMLDetailsElement).open))).toBe(true);
    expect(await groups.first().locator('.worst-change').innerText()).toMatch(/→/);
  });

  it('gives a build the same colour and marker whatever the build order', async () => {
    const reversed: ResultsFile = { ...results, builds: [...results.builds].reverse(), runs: [...results.runs].reverse() };
    const other = path.join(dir, 'reversed.html');
    writeFileSync(other, renderReportHtml(reversed, { outDir: dir, baseline: BASELINE }));
    const second = await newPage(pathToFileURL(other).href, { width: 1400, height: 900 });
    const styles = (p: Page) =>
      p.locator('#matrix thead th[data-build]').evaluateAll((ths) =>
        Object.fromEntries(
          ths.map((th) => {
            const paths = th.querySelectorAll('svg.swatch path');
            return [th.textContent?.replace('baseline', '').trim() ?? '', `${paths[0]?.getAttribute('stroke')} ${paths[1]?.getAttribute('d')?.length}`];
          }),
        ),
      );
    const a = await styles(page);
    const b = await styles(second);
    const orderA = Object.keys(a);
    const orderB = Object.keys(b);
    expect(orderB).toEqual([...orderA].reverse());
    expect(b).toEqual(a);
    // Distinct builds of the bundled run get distinct styles.
    expect(new Set(Object.values(a)).size).toBe(orderA.length);
    await second.close();
  });

  it('hides no overview marker behind another, and marks pass (filled) and fail (hollow)', async () => {
    const svgs = await page.locator('#overview svg.dots').evaluateAll((list) =>
      list.map((svg) => [...svg.querySelectorAll('path.dot')].map((d) => {
        const r = d.getBoundingClientRect();
        return { x0: r.left, y0: r.top, x1: r.right, y1: r.bottom, pass: d.classList.contains('pass'), fill: d.getAttribute('fill') };
      })),
    );
    expect(svgs.length).toBe(2 * new Set(results.runs.map((r) => `${r.scenario.id}\u0000${r.scenario.hash}`)).size);
    for (const boxes of svgs) {
      for (let i = 0; i < boxes.length; i++) {
        for (let j = 0; j < boxes.length; j++) {
          if (i === j) continue;
          const [a, b] = [boxes[i], boxes[j]];
          const covered = a.x0 >= b.x0 && a.x1 <= b.x1 && a.y0 >= b.y0 && a.y1 <= b.y1;
          expect(covered, `marker ${i} inside marker ${j}`).toBe(false);
        }
      }
      for (const b of boxes) expect(b.fill === '#fff').toBe(!b.pass);
    }
    const passing = results.runs.filter((r) => r.status === 'pass' && r.metrics).length;
    expect(await page.locator('#overview svg.dots.margin path.dot.pass').count()).toBe(passing);
  });

  it('zooms every time plot of a scenario to the chosen window, and back to the full run', async () => {
    const section = page.locator('details.scenario').nth(1);
    await section.evaluate((d) => ((d as HTMLDetailsElement).open = true));
    const plots = section.locator('svg.plot[data-tmax]');
    const count = await plots.count();
    expect(count).toBeGreaterThan(5);
    await section.locator('.zoom-from').fill('1');
    await section.locator('.zoom-from').dispatchEvent('change');
    await section.locator('.zoom-to').fill('3');
    await section.locator('.zoom-to').dispatchEvent('change');
    const zoomed = await plots.evaluateAll((svgs) =>
      svgs.map((svg) => ({
        window: svg.getAttribute('data-window'),
        transformed: [...svg.querySelectorAll('g.tz')].every((g) => /^matrix\(/.test(g.getAttribute('transform') ?? '')),
        firstTick: Number(svg.querySelector('g.taxis text')?.textContent),
      })),
    );
    for (const z of zoomed) expect(z).toEqual({ window: '1.0000 3.0000', transformed: true, firstTick: 1 });
    // A drag across one plot narrows the window of all of them.
    await plots.first().scrollIntoViewIfNeeded();
    const box = (await plots.first().boundingBox())!;
    await page.mouse.move(box.x + box.width * 0.4, box.y + 30);
    await page.mouse.down();
    await page.mouse.move(box.x + box.width * 0.7, box.y + 30, { steps: 4 });
    await page.mouse.up();
    const windows = await plots.evaluateAll((svgs) => svgs.map((svg) => svg.getAttribute('data-window')));
    expect(new Set(windows).size).toBe(1);
    const [a, b] = (windows[0] ?? '').split(' ').map(Number);
    expect(a).toBeGreaterThan(1);
    expect(b).toBeLessThan(3);
    await section.locator('.zoom-reset').click();
    expect(await plots.evaluateAll((svgs) => svgs.every((svg) => !svg.hasAttribute('data-window') && [...svg.querySelectorAll('g.tz')].every((g) => !g.hasAttribute('transform'))))).toBe(true);
  });

  it('marks pushes, command changes and falls on the time plots, and names feet by the robot\'s legs', async () => {
    const pushed = page.locator('details.scenario', { hasText: 'lateral-push-dry' }).first();
    const plots = pushed.locator('svg.plot.friction-use');
    expect(await plots.count()).toBe(DEFAULT_BUILDS.length);
    for (const counts of await plots.evaluateAll((svgs) => svgs.map((s) => ({ push: s.querySelectorAll('path.event.push').length, legs: [...s.querySelectorAll('text.foot')].map((t) => t.textContent) })))) {
      expect(counts).toEqual({ push: 4, legs: ['FL', 'FR', 'HL', 'HR'] });
    }
    const fell = results.runs.filter((r) => r.metrics?.fell).length;
    expect(await page.locator('svg.plot.friction-use path.event.fall').count()).toBe(4 * fell);
  });

  it('saves a plot as SVG and its series as CSV matching what is plotted', async () => {
    const section = page.locator('details.scenario').nth(1);
    await section.evaluate((d) => ((d as HTMLDetailsElement).open = true));
    const figure = section.locator('figure.panel:has(svg.plot.friction-use)').first();
    const build = await figure.locator('figcaption').evaluate((c) => c.childNodes[1]?.textContent?.trim() ?? '');
    const scenarioId = (await section.locator('summary .id').innerText()).split(' ')[0];
    const [csvDownload] = await Promise.all([page.waitForEvent('download'), figure.locator('button.save-csv').click()]);
    const csv = readFileSync((await csvDownload.path())!, 'utf8').trim().split('\n');
    expect(csv[0]).toBe('series,t_s,value');
    const series = JSON.parse(readFileSync(path.join(dir, seriesPath(scenarioId, build)), 'utf8')) as RunSeries;
    // The plot's buckets: the series merged down to PLOT_BUCKETS (min of mins, max of maxes), clamped to the 0 … 1.3 axis.
    const { start, end } = groupRanges(series.t_s.length, PLOT_BUCKETS);
    const foot0 = mergeGroups(series.feet[0].frictionUse, start, end);
    const rows = csv.slice(1).map((line) => {
      const m = /^"(.*)",([^,]+),([^,]+)$/.exec(line)!;
      return { name: m[1], t: Number(m[2]), v: Number(m[3]) };
    });
    const first = rows.filter((r) => r.name === rows[0].name);
    expect(first[0].name).toMatch(/friction use$/);
    // y resolution: 0.1 px of a 58 px strip spanning 1.3 (the path's rounding).
    const tolerance = (0.1 / 58) * 1.3 + 1e-6;
    const values = foot0.min.flatMap((lo, g) => (lo === null ? [] : [Math.min(1.3, lo), Math.min(1.3, foot0.max[g] ?? lo)]));
    for (const r of first) expect(values.some((v) => Math.abs(v - r.v) <= tolerance), `${r.t} s: ${r.v}`).toBe(true);
    const distinctTimes = new Set(first.map((r) => r.t.toFixed(3))).size;
    expect(distinctTimes).toBe(foot0.min.filter((v) => v !== null).length);
    expect(new Set(rows.map((r) => r.name)).size).toBe(series.footCount);

    const [svgDownload] = await Promise.all([page.waitForEvent('download'), figure.locator('button.save-svg').click()]);
    const svg = readFileSync((await svgDownload.path())!, 'utf8');
    const onPage = await figure.locator('svg.plot path.series').evaluateAll((ps) => ps.map((p) => p.getAttribute('d')));
    for (const d of onPage) expect(svg).toContain(`d="${d}"`);
    expect(svg).toContain('<clipPath id="tclip"');
    expect(svg.startsWith('<?xml')).toBe(true);
  });

  it('loads with no console error and no network request', () => {
    expect(consoleErrors).toEqual([]);
    expect(requests.filter((r) => !r.startsWith('file://') && !r.startsWith('blob:'))).toEqual([]);
  });

  it('reads at 800 px wide without horizontal scrolling of the main tables', async () => {
    const narrow = await newPage(url, { width: 800, height: 900 });
    const widths = await narrow.evaluate(() => ({
      page: document.documentElement.scrollWidth,
      tables: ['table.rollup', 'table.builds', 'table.overview', 'table.matrix'].map((sel) => {
        const t = document.querySelector(sel) as HTMLElement;
        return { sel, right: t.getBoundingClientRect().right, scroll: (t.parentElement as HTMLElement).scrollWidth - (t.parentElement as HTMLElement).clientWidth };
      }),
    }));
    expect(widths.page).toBeLessThanOrEqual(800);
    for (const t of widths.tables) {
      expect(t.right, t.sel).toBeLessThanOrEqual(800);
      expect(t.scroll, t.sel).toBeLessThanOrEqual(0);
    }
    await narrow.close();
  });

  it('keeps every plot inside the page and unbroken when printed', async () => {
    const printed = await newPage(url, { width: 1000, height: 900 });
    await printed.emulateMedia({ media: 'print' });
    await printed.evaluate(() => document.querySelectorAll<HTMLDetailsElement>('details.scenario').forEach((d) => (d.open = true)));
    const out = await printed.evaluate(() => {
      const width = document.documentElement.clientWidth;
      const figures = [...document.querySelectorAll('figure.panel')];
      return {
        width,
        overflow: [...document.querySelectorAll('svg.plot')].filter((s) => s.getBoundingClientRect().right > width + 0.5).length,
        unbroken: figures.every((f) => getComputedStyle(f).breakInside === 'avoid'),
        controls: getComputedStyle(document.querySelector('.zoom') as Element).display,
      };
    });
    expect(out).toEqual({ width: out.width, overflow: 0, unbroken: true, controls: 'none' });
    await printed.close();
  });

  it('shows the whole page and the full time window with scripts blocked', async () => {
    const still = await newPage(url, { width: 1400, height: 900 }, false);
    expect(await still.locator('table.rollup').isVisible()).toBe(true);
    expect(await still.locator('.zoom').first().isVisible()).toBe(false);
    expect(await still.locator('button.save-svg').count()).toBe(0);
    expect(await still.locator('g.tz[transform]').count()).toBe(0);
    const open = still.locator('details.scenario[open]').first();
    expect(await open.locator('svg.plot.friction-use').first().isVisible()).toBe(true);
    await still.close();
  });

  it('grows the report by no more than 25 % per run for the same data', () => {
    // Same data: the telemetry plots draw data the runs did not record when the figure above was
    // taken (build telemetry is recorded since), so they are left out of the comparison.
    const sameData = html.replace(/<svg class="plot telemetry"[\s\S]*?<\/svg>/g, '');
    expect((Buffer.byteLength(sameData) - BYTES_OF_DATA_ADDED_SINCE) / results.runs.length).toBeLessThanOrEqual(1.25 * BYTES_PER_RUN_BEFORE);
  });
});
