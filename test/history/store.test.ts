import { mkdtempSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import { describe, expect, it } from 'vitest';
import { generateNight } from '../../harness/history/generate.js';
import { resultsIdentity } from '../../harness/history/identity.js';
import { runMetricValues } from '../../harness/history/metrics.js';
import { SCHEMA_VERSION } from '../../harness/history/schema.js';
import { openSqliteStore } from '../../harness/history/sqliteStore.js';
import { HistoryStoreError } from '../../harness/history/types.js';
import { sampleResults } from '../results/fixtures.js';

const tempStore = () => path.join(mkdtempSync(path.join(tmpdir(), 'footing-history-')), 'history.sqlite');
const options = { nights: 10, scenarios: 4, builds: 2, seed: 3 };

describe('history store (SQLite)', () => {
  it('keeps every scalar metric of every run, with the night, its commit, builds and scenario hashes', () => {
    const store = openSqliteStore(tempStore());
    const results = sampleResults();
    const outcome = store.add(results, { source: 'sample' });
    expect(outcome.added).toBe(true);
    expect(outcome.night).toMatchObject({
      startedAt: results.startedAt,
      commit: 'abc123',
      runs: results.runs.length,
      passed: results.runs.filter((r) => r.status === 'pass').length,
      builds: results.builds.map((b) => ({ name: b.name, commit: typeof b.commit === 'string' ? b.commit : null })),
      source: 'sample',
    });
    const stored = [...store.exportRows()];
    const expected = results.runs.flatMap((run) => runMetricValues(run).map(([metric, value]) => `${run.scenario.id}|${run.scenario.hash}|${run.build}|${run.status}|${metric}|${value}`));
    expect(stored.map((r) => `${r.scenario}|${r.scenarioHash}|${r.build}|${r.status}|${r.metric}|${r.value}`).sort()).toEqual(expected.sort());
    store.close();
  });

  it('answers a trend query oldest night first, with each night\'s commit and status', () => {
    const store = openSqliteStore(tempStore());
    const nights = Array.from({ length: options.nights }, (_, k) => generateNight(options, k));
    // Added out of order: the trend is ordered by the nights' start times, not by when they were added.
    for (const night of [...nights].reverse()) store.add(night);
    const trend = store.trend({ scenario: 'generated-002', build: 'build-1', metric: 'frictionMargin.min' });
    expect(trend.map((p) => p.startedAt)).toEqual(nights.map((n) => n.startedAt));
    const run = (k: number) => nights[k].runs.find((r) => r.scenario.id === 'generated-002' && r.build === 'build-1');
    expect(trend.map((p) => p.value)).toEqual(nights.map((_, k) => run(k)?.metrics?.frictionMargin.min));
    expect(trend.map((p) => p.commit)).toEqual(nights.map((n) => n.builds[0].commit));
    expect(store.trend({ scenario: 'generated-002', build: 'build-1', metric: 'no.such.metric' }).every((p) => p.value === null)).toBe(true);
    expect(store.series()).toHaveLength(options.scenarios * options.builds);
    store.close();
  });

  it('changes nothing when the same results are added twice, even re-serialised with other key order', () => {
    const file = tempStore();
    const store = openSqliteStore(file);
    const night = generateNight(options, 0);
    store.add(night);
    const before = [...store.exportRows()].length;
    const reordered = JSON.parse(JSON.stringify(night, Object.keys(night).reverse()));
    Object.assign(reordered, night);
    expect(resultsIdentity(reordered)).toBe(resultsIdentity(night));
    const again = store.add(reordered);
    expect(again.added).toBe(false);
    expect(store.nights()).toHaveLength(1);
    expect([...store.exportRows()]).toHaveLength(before);
    store.close();
  });

  it('creates the schema at the current version and refuses a store newer than it knows', () => {
    const file = tempStore();
    const store = openSqliteStore(file);
    expect(store.schemaVersion()).toBe(SCHEMA_VERSION);
    store.close();
    const raw = new Database(file);
    raw.pragma(`user_version = ${SCHEMA_VERSION + 1}`);
    raw.close();
    expect(() => openSqliteStore(file)).toThrow(new RegExp(`schema version ${SCHEMA_VERSION + 1} is newer than this Footing knows \\(${SCHEMA_VERSION}\\)`));
  });

  it('names the file when it is not a store', () => {
    const file = tempStore();
    writeFileSync(file, 'results,not,a,database\n'.repeat(100));
    expect(() => openSqliteStore(file)).toThrow(HistoryStoreError);
    expect(() => openSqliteStore(file)).toThrow(/history\.sqlite: not a history store/);
    expect(() => openSqliteStore(path.join(path.dirname(file), 'missing.sqlite'), { readonly: true })).toThrow(/no history store there yet/);
  });

  it('grows the file in proportion to the nights stored (generated data)', () => {
    const file = tempStore();
    const shape = { nights: 40, scenarios: 25, builds: 3, seed: 5 };
    // Closing folds the write-ahead log into the file, so the file's size is the store's.
    const sizeAfter = (from: number, to: number) => {
      const store = openSqliteStore(file);
      for (let k = from; k < to; k++) store.add(generateNight(shape, k));
      store.close();
      return statSync(file).size;
    };
    const twenty = sizeAfter(0, 20);
    const forty = sizeAfter(20, 40);
    const store = openSqliteStore(file, { readonly: true });
    const values = [...store.exportRows()].length;
    store.close();
    // Linear growth: twice the nights, about twice the file (pages fill unevenly: ±20 %, common practice).
    expect(forty / twenty).toBeGreaterThan(1.6);
    expect(forty / twenty).toBeLessThan(2.4);
    // Bytes per stored value: 365 nights × 200 scenarios × 3 builds must stay under 200 MB.
    const perValue = forty / values;
    const fullYear_MB = (perValue * (values / (40 * 25 * 3)) * 365 * 200 * 3) / 1e6;
    console.info(`history store: ${perValue.toFixed(1)} bytes per metric value; 365 × 200 × 3 extrapolates to ${fullYear_MB.toFixed(0)} MB`);
    expect(fullYear_MB).toBeLessThan(200);
  });
});

describe('history bench (smoke test: small shape, figures finite — no timed assertion)', () => {
  it('loads the generated nights and measures the trend query', async () => {
    const { benchHistory, renderHistoryBench } = await import('../../harness/history/bench.js');
    const figures = await benchHistory({ nights: 12, scenarios: 5, builds: 2, time_ms: 20 });
    expect(figures.runs).toBe(12 * 5 * 2);
    expect(figures.metricValues).toBeGreaterThan(figures.runs * 20);
    expect(figures.fileSize_MB).toBeGreaterThan(0);
    expect(Number.isFinite(figures.scenarioTrend.mean_us) && figures.scenarioTrend.mean_us > 0).toBe(true);
    expect(renderHistoryBench(figures)[0]).toMatch(/^history store: 12 nights × 5 scenarios × 2 builds = 120 runs/);
  });
});
