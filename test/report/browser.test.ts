// The report in a real browser: Debian's chromium driven by playwright-core, the page opened from
// file:// as an engineer would open it on an air-gapped lab machine.
import { existsSync, mkdirSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { renderReportHtml } from '../../harness/report/index.js';
import type { ResultsFile } from '../../harness/results/types.js';
import { withMarginData } from './margin-support.js';
import { HOSTILE_STDERR, HOSTILE_TITLE, smallRun } from './support.js';

const CHROMIUM = '/usr/bin/chromium';
const ARTIFACTS = 'test/.artifacts';
const available = existsSync(CHROMIUM);
const inCI = process.env.CI === 'true';

if (!available) {
  const message = `\n${'!'.repeat(78)}\n!! ${CHROMIUM} is missing: the report's browser test is ${inCI ? 'FAILING (CI=true)' : 'SKIPPED'}.\n!! Install it with: apt-get install -y chromium\n${'!'.repeat(78)}\n`;
  console.warn(message);
}

describe('report without a browser', () => {
  it.runIf(!available && inCI)('fails in CI when chromium is not installed', () => {
    expect.fail(`${CHROMIUM} not found; .ci/run installs it with apt-get install -y chromium`);
  });
});

describe.skipIf(!available)('report in headless chromium', () => {
  let context: BrowserContext;
  let page: Page;
  let url: string;
  let marginUrl: string;
  let marginResults: ResultsFile;
  const consoleErrors: string[] = [];
  const requests: string[] = [];

  beforeAll(async () => {
    const { dir, results } = await smallRun();
    url = pathToFileURL(path.join(dir, 'report.html')).href;
    // The same run with hand-written margin searches and family scores (margin-support.ts).
    marginResults = withMarginData(results);
    writeFileSync(path.join(dir, 'margin.html'), renderReportHtml(marginResults, { outDir: dir, baseline: 'nominal' }));
    marginUrl = pathToFileURL(path.join(dir, 'margin.html')).href;
    context = await chromium.launchPersistentContext(mkdtempSync(path.join(tmpdir(), 'footing-chromium-')), {
      executablePath: CHROMIUM,
      headless: true,
      args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--no-first-run', '--disable-sync', '--disable-quic'],
      viewport: { width: 1400, height: 1000 },
    });
    page = await context.newPage();
    page.on('console', (message) => {
      if (message.type() === 'error') consoleErrors.push(message.text());
    });
    page.on('pageerror', (error) => consoleErrors.push(String(error)));
    page.on('dialog', (dialog) => {
      consoleErrors.push(`dialog opened: ${dialog.message()}`);
      void dialog.dismiss();
    });
    page.on('request', (request) => requests.push(request.url()));
    await page.goto(url, { waitUntil: 'load' });
  });

  afterAll(async () => {
    await context?.close();
  });

  it('loads with no console error, no script dialog and no network request besides the file itself', async () => {
    expect(consoleErrors).toEqual([]);
    expect(requests).toEqual([url]);
  });

  it('names every build and every scenario in the verdict and the matrix', async () => {
    const verdict = await page.locator('#verdict').innerText();
    const matrix = await page.locator('#matrix').innerText();
    for (const build of ['nominal', 'governed', 'broken']) {
      expect(verdict).toContain(build);
      expect(matrix).toContain(build);
    }
    for (const id of ['shaped-floor', 'hostile-title']) expect(matrix).toContain(id);
  });

  it('shows the hostile title and the build stderr as text', async () => {
    expect(await page.locator('details.scenario summary .scenario-title').allInnerTexts()).toContain(HOSTILE_TITLE);
    await page.evaluate(() => document.querySelectorAll<HTMLDetailsElement>('details').forEach((d) => (d.open = true)));
    const stderr = await page.locator('pre.stderr').first().textContent();
    expect(stderr?.trim()).toBe(HOSTILE_STDERR);
    // Nothing from user text became an element.
    expect(await page.locator('main script, main img, main b').count()).toBe(0);
  });

  it('draws every plot with a non-empty path', async () => {
    const plots = await page.locator('svg.plot').evaluateAll((svgs) =>
      svgs.map((svg) => {
        const paths = [...svg.querySelectorAll('path.series, path.footholds, path.trunk')];
        return { kind: svg.getAttribute('class'), drawn: paths.some((p) => (p.getAttribute('d') ?? '').length > 3 && (p as SVGPathElement).getTotalLength() >= 0) };
      }),
    );
    expect(plots.length).toBeGreaterThan(10);
    for (const plot of plots) expect(plot, `${plot.kind}`).toEqual({ kind: plot.kind, drawn: true });
    // The floor panels place the scenario's friction map (a <use> of its definition) and it renders.
    const floorBoxes = await page.locator('svg.plot.floor use').evaluateAll((uses) => uses.map((u) => (u as SVGGraphicsElement).getBBox().width));
    expect(floorBoxes.length).toBeGreaterThan(0);
    expect(floorBoxes.some((w) => w > 0)).toBe(true);
  });

  it('plots every telemetry scalar each build recorded, under its name prefix, and hides them with their build', async () => {
    // results.json is the record: each run names its telemetry scalars with their extremes
    // (null when no tick recorded one). The page must show exactly those, per scenario and build.
    await page.locator('button[data-action="expand"]').click();
    const results = JSON.parse(readFileSync(path.join(path.dirname(fileURLToPath(url)), 'results.json'), 'utf8')) as ResultsFile;
    const builds = [...new Set(results.runs.map((r) => r.build))];
    let checked = 0;
    for (const run of results.runs) {
      const recorded = (run.telemetry ?? []).filter((t) => t.min !== null).map((t) => t.name);
      const section = page.locator('details.scenario').filter({ has: page.locator(`summary .id:text-matches("^${run.scenario.id} ")`) });
      const block = section.locator(`div.telemetry[data-build="${builds.indexOf(run.build)}"]`);
      if (recorded.length === 0) {
        expect(await block.count(), `${run.scenario.id} × ${run.build}`).toBe(0);
        continue;
      }
      // Target/applied pairs of the governor are drawn together in the governor panels (one per
      // axis, or a line saying they stayed constant); every other scalar gets a figure of its own,
      // grouped by prefix in the order the build names them.
      const paired = recorded.filter((name) => /^governor\.(target|applied)\./.test(name));
      const own = recorded.filter((name) => !paired.includes(name));
      const prefixes = [...new Set(own.map((name) => name.split('.')[0]))];
      const grouped = prefixes.flatMap((prefix) => own.filter((name) => name.split('.')[0] === prefix));
      // A caption is the name, then the page's own SVG/CSV download buttons.
      expect((await block.locator('figure figcaption').allInnerTexts()).map((text) => text.split('\n')[0])).toEqual(grouped);
      expect(await block.locator('h5').allInnerTexts()).toEqual(prefixes.map((prefix) => expect.stringContaining(`${run.build} · ${prefix}`)));
      const drawn = await block.locator('svg.plot').evaluateAll((svgs) => svgs.map((svg) => [...svg.querySelectorAll('path')].some((p) => (p as SVGPathElement).getTotalLength() > 0)));
      expect(drawn).toEqual(grouped.map(() => true));
      const governorText = (await section.locator(`[data-build="${builds.indexOf(run.build)}"]:is(.panel-group, p.hint)`).allInnerTexts()).join('\n');
      for (const axis of new Set(paired.map((name) => name.split('.').slice(2).join('.')))) expect(governorText, `${run.scenario.id} × ${run.build}`).toContain(axis);
      checked++;
    }
    // The governed reference build names governor.* and core scalars on every scenario it ran.
    expect(checked).toBeGreaterThanOrEqual(results.runs.filter((r) => r.build === 'governed').length);
    const governed = page.locator(`div.telemetry[data-build="${builds.indexOf('governed')}"]`).first();
    expect(await governed.isVisible()).toBe(true);
    await page.locator(`input[data-filter="${builds.indexOf('governed')}"]`).uncheck();
    expect(await governed.isVisible()).toBe(false);
    await page.locator(`input[data-filter="${builds.indexOf('governed')}"]`).check();
  });

  it('collapses and opens a scenario section by its summary', async () => {
    const section = page.locator('details.scenario').first();
    await page.evaluate(() => document.querySelectorAll<HTMLDetailsElement>('details.scenario').forEach((d) => (d.open = false)));
    await section.locator(':scope > summary').click();
    expect(await section.evaluate((d) => (d as HTMLDetailsElement).open)).toBe(true);
    expect(await section.locator('svg.plot').first().isVisible()).toBe(true);
    await section.locator(':scope > summary').click();
    expect(await section.evaluate((d) => (d as HTMLDetailsElement).open)).toBe(false);
    expect(await section.locator('svg.plot').first().isVisible()).toBe(false);
  });

  it('filters a build out and back in', async () => {
    const header = page.locator('#matrix thead th[data-build="1"]');
    expect(await header.isVisible()).toBe(true);
    await page.locator('input[data-filter="1"]').uncheck();
    expect(await header.isVisible()).toBe(false);
    await page.locator('input[data-filter="1"]').check();
    expect(await header.isVisible()).toBe(true);
  });

  it('opens the linked scenario from the regression list (grouped by scenario, collapsed)', async () => {
    await page.locator('button[data-action="collapse"]').click();
    await page.evaluate(() => document.querySelectorAll<HTMLDetailsElement>('details.reg-group').forEach((d) => (d.open = false)));
    expect(await page.locator('table.regressions').first().isVisible()).toBe(false);
    const link = page.locator('details.reg-group > summary a').first();
    const target = (await link.getAttribute('href'))?.slice(1) ?? '';
    await link.click();
    expect(await page.locator(`[id="${target}"]`).evaluate((d) => (d as HTMLDetailsElement).open)).toBe(true);
  });

  it('draws the margin strips and family bars with one mark per probe, and filters them by build', async () => {
    const before = consoleErrors.length;
    const marginPage = await context.newPage();
    const marginRequests: string[] = [];
    marginPage.on('console', (message) => {
      if (message.type() === 'error') consoleErrors.push(message.text());
    });
    marginPage.on('request', (request) => marginRequests.push(request.url()));
    await marginPage.goto(marginUrl, { waitUntil: 'load' });
    expect(consoleErrors.slice(before)).toEqual([]);
    expect(marginRequests).toEqual([marginUrl]);
    const samples = marginResults.runs.reduce((n, r) => n + (r.margin?.friction?.samples.length ?? 0) + (r.margin?.push?.samples.length ?? 0), 0);
    expect(await marginPage.locator('#margin svg.strip path.probe').count()).toBe(samples);
    expect(await marginPage.locator('#families svg.interval path.ci').count()).toBe(2);
    const boxes = await marginPage.locator('#margin svg.strip').evaluateAll((svgs) => svgs.map((s) => (s as SVGGraphicsElement).getBoundingClientRect().width));
    expect(boxes.every((w) => w > 100)).toBe(true);
    const row = marginPage.locator('#margin .strip-row[data-build="1"]').first();
    expect(await row.isVisible()).toBe(true);
    mkdirSync(ARTIFACTS, { recursive: true });
    await marginPage.locator('#margin').screenshot({ path: path.join(ARTIFACTS, 'report-margin.png') });
    await marginPage.locator('input[data-filter="1"]').uncheck();
    expect(await row.isVisible()).toBe(false);
    await marginPage.close();
  });

  it('saves a screenshot of the page with every section open', async () => {
    mkdirSync(ARTIFACTS, { recursive: true });
    await page.locator('button[data-action="expand"]').click();
    await page.evaluate(() => window.scrollTo(0, 0));
    const file = path.join(ARTIFACTS, 'report.png');
    await page.screenshot({ path: file, fullPage: true });
    expect(existsSync(file)).toBe(true);
  });
});
