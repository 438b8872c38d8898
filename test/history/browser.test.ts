// The trend page in a real browser, as test/report/browser.test.ts does for the build report:
// Debian's chromium through playwright-core, the page opened from file://.
import { existsSync, mkdirSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { defaultPolicy } from '../../harness/gate/defaults.js';
import { renderTrendPage } from '../../harness/history/render.js';
import { buildTrendModel, type TrendModel } from '../../harness/history/trend.js';
import { generatedStore, HOSTILE_BUILD } from './support.js';

const CHROMIUM = '/usr/bin/chromium';
const ARTIFACTS = 'test/.artifacts';
const available = existsSync(CHROMIUM);

describe('trend page without a browser', () => {
  it.runIf(!available && process.env.CI === 'true')('fails in CI when chromium is not installed', () => {
    expect.fail(`${CHROMIUM} not found; .ci/run installs it with apt-get install -y chromium`);
  });
});

describe.skipIf(!available)('trend page in headless chromium', () => {
  let context: BrowserContext;
  let page: Page;
  let url: string;
  let model: TrendModel;
  const errors: string[] = [];
  const requests: string[] = [];

  beforeAll(async () => {
    const { store } = generatedStore();
    model = buildTrendModel(store, { policy: defaultPolicy() });
    store.close();
    const dir = mkdtempSync(path.join(tmpdir(), 'footing-trend-page-'));
    const file = path.join(dir, 'trend.html');
    writeFileSync(file, renderTrendPage(model));
    url = pathToFileURL(file).href;
    context = await chromium.launchPersistentContext(mkdtempSync(path.join(tmpdir(), 'footing-chromium-')), {
      executablePath: CHROMIUM,
      headless: true,
      args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--no-first-run', '--disable-sync', '--disable-quic'],
      viewport: { width: 1200, height: 900 },
    });
    page = await context.newPage();
    page.on('console', (message) => {
      if (message.type() === 'error') errors.push(message.text());
    });
    page.on('pageerror', (error) => errors.push(String(error)));
    page.on('dialog', (dialog) => {
      errors.push(`dialog opened: ${dialog.message()}`);
      void dialog.dismiss();
    });
    page.on('request', (request) => requests.push(request.url()));
    await page.goto(url, { waitUntil: 'load' });
  });

  afterAll(async () => {
    await context?.close();
  });

  it('loads with no console error, no dialog and no request besides the file', () => {
    expect(errors).toEqual([]);
    expect(requests).toEqual([url]);
  });

  it('draws one trend plot per line with a drawn series, and one change rule per change point', async () => {
    const lines = model.scenarios.reduce((n, s) => n + s.lines.length, 0);
    expect(await page.locator('svg.trend').count()).toBe(lines);
    const lengths = await page.locator('svg.trend path.series').evaluateAll((paths) => paths.map((p) => (p as SVGPathElement).getTotalLength()));
    expect(lengths.every((l) => l > 100)).toBe(true);
    expect(await page.locator('svg.trend path.change').count()).toBe(model.changeCount);
    expect(model.changeCount).toBeGreaterThan(0);
    // The gate line is inside the plot of every margin line.
    const limits = await page.locator('[data-metric="stanceMargin.min"] svg.trend path.limit').count();
    expect(limits).toBe(model.scenarios.reduce((n, s) => n + s.lines.filter((l) => l.metric === 'stanceMargin.min').length, 0));
  });

  it('lists each change point with the nights and commits either side, and shows hostile names as text', async () => {
    const table = await page.locator('table.changes').innerText();
    const change = model.scenarios.flatMap((s) => s.lines.flatMap((l) => l.changes))[0];
    expect(table).toContain(change.before.commit);
    expect(table).toContain(change.after.commit);
    expect(await page.locator('main img, main script').count()).toBe(0);
    expect(await page.locator('#nights').innerText()).toContain(HOSTILE_BUILD);
    mkdirSync(ARTIFACTS, { recursive: true });
    await page.locator('#trend-generated-002').screenshot({ path: path.join(ARTIFACTS, 'history-trend.png') });
  });
});
