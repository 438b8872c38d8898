// A series' loop-time histogram is read from disk and drawn on a log axis: a budget of 0 or a bin
// edge at 10^10000 µs once made the plot ask for endless decades (found by the crafted-file fuzz,
// test/report/crafted.test.ts, seed -206466825: budget_us replaced by 0). Such a file is refused by
// the validator with its pointer, and the plot alone stays bounded whatever it is given.

import { mkdtempSync, readdirSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { runSuite } from '../../../harness/commands/run.js';
import { loopTimePlot } from '../../../harness/report/plot/timeSeries.js';
import type { RunSeries } from '../../../harness/score/series/types.js';
import { validateSeries } from '../../../harness/score/series/validate.js';

let series: RunSeries;

beforeAll(async () => {
  const out = mkdtempSync(path.join(tmpdir(), 'footing-looptime-'));
  await runSuite({ paths: ['test/run/fixtures/brief'], builds: ['ref:nominal'], outDir: out, jobs: 1, quiet: true });
  const dir = path.join(out, 'series');
  series = JSON.parse(readFileSync(path.join(dir, readdirSync(dir)[0]), 'utf8')) as RunSeries;
}, 60_000);

const variant = (patch: Partial<RunSeries['loopTime']>): RunSeries => ({ ...series, loopTime: { ...series.loopTime, ...patch } });

describe('loop-time histogram bounds', () => {
  it('a recorded series is valid and draws', () => {
    expect(validateSeries(series).ok).toBe(true);
    expect(String(loopTimePlot(series))).toContain('budget');
  });

  it('a budget of 0 is refused, naming /loopTime/budget_us', () => {
    const result = validateSeries(variant({ budget_us: 0 }));
    expect(result.ok).toBe(false);
    expect(!result.ok && result.problem).toMatch(/^\/loopTime\/budget_us /);
  });

  it('a bin ending beyond 1000 s is refused, naming the bin', () => {
    const result = validateSeries(variant({ start_us: 1e6, ratio: 10, bins: [[0, 1], [10_000, 1]] }));
    expect(result.ok).toBe(false);
    expect(!result.ok && result.problem).toMatch(/^\/loopTime\/bins\/1 bin 10000 ends beyond/);
  });

  it('the plot stays a few kilobytes for inputs the validator would refuse', () => {
    for (const patch of [{ budget_us: 0 }, { start_us: 1e6, ratio: 10, bins: [[10_000, 1]] as [number, number][] }, { budget_us: Number.NaN }]) {
      expect(String(loopTimePlot(variant(patch))).length).toBeLessThan(20_000);
    }
  });
});
