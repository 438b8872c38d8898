import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { spread, summarizeFamilies } from '../../harness/results/familySummary.js';
import { wilsonInterval } from '../../harness/score/proportion.js';
import { readResultsFile } from '../../harness/results/read.js';
import { RESULTS_FORMAT_VERSION } from '../../harness/results/types.js';
import { validateResults } from '../../harness/results/validate.js';
import { scenarioHash } from '../../harness/scenario/canonical.js';
import { results, scoredRun, stand } from '../gate/fixtures.js';
import { makeScenario } from '../score/fixtures.js';

describe('results format 2', () => {
  it('reads a format-1 file, migrated in memory to format 2', () => {
    const v2 = results([scoredRun(stand, 'main')]);
    const dir = mkdtempSync(path.join(tmpdir(), 'footing-v1-'));
    writeFileSync(path.join(dir, 'results.json'), JSON.stringify({ ...v2, formatVersion: 1 }));
    const read = readResultsFile(dir);
    expect(RESULTS_FORMAT_VERSION).toBe(2);
    expect(read.results.formatVersion).toBe(2);
    expect(read.results.runs).toEqual(v2.runs);
  });

  it('validates margin data on a run and rejects a malformed one', () => {
    const run = scoredRun(stand, 'main');
    const margin = {
      friction: {
        outcome: 'found', criticalScale: 0.54, bracket: { failing: 0.53, passing: 0.54 }, range: [0.05, 1], tolerance: 0.01, monotone: true,
        runs: 11, bisectionRuns: 7, wall_s: 1.2, lowestStaticFriction: 0.5, criticalStaticFriction: 0.27,
        samples: [{ scale: 1, status: 'pass', role: 'nominal', slipDistance_m: 0, frictionMarginMin: 0.4, fell: false, reasons: [] }],
      },
      push: null,
      notes: ['no push search: the scenario has no pushes'],
    };
    expect(validateResults(results([{ ...run, margin } as never])).ok).toBe(true);
    const bad = validateResults(results([{ ...run, margin: { ...margin, friction: { ...margin.friction, criticalScale: 'low' } } } as never]));
    expect(bad.ok).toBe(false);
    expect(!bad.ok && bad.issues.map((i) => i.path).join(' ')).toMatch(/\/runs\/0\/margin\/friction\/criticalScale/);
  });

  it('summarises each family per build with a Wilson interval and metric spreads', () => {
    const runs = Array.from({ length: 10 }, (_, i) => {
      const s = makeScenario({ id: `fam-s${String(i + 1).padStart(2, '0')}`, family: { id: 'fam', sample: i + 1, samples: 10, params: { frictionScale: 0.6 } } });
      return scoredRun({ ...s, hash: scenarioHash(s) }, 'main', i < 8 ? { fx_N: i } : { fallAt: 400 });
    });
    const file = results(runs);
    expect(validateResults(file).ok).toBe(true);
    expect(file.families).toHaveLength(1);
    const f = file.families![0];
    expect(f).toMatchObject({ id: 'fam', build: 'main', samples: 10, runs: 10, successes: 8, errors: 0, successRate: 0.8 });
    const w = wilsonInterval(8, 10);
    expect(f.interval).toEqual({ method: 'wilson', confidence: 0.95, lower: w.lower, upper: w.upper });
    expect(f.frictionMarginMin!.count).toBe(10);
    expect(summarizeFamilies(runs.slice(0, 4))[0].runs).toBe(4);
  });

  it('computes spreads by linear interpolation between order statistics (Hyndman & Fan type 7)', () => {
    // 1..11: type-7 p10 = 1 + 0.1·10 = 2, median 6, p90 10 (R's default quantile, from memory).
    expect(spread([11, 3, 1, 2, 4, 5, 6, 7, 8, 9, 10, null])).toEqual({ count: 11, min: 1, p10: 2, median: 6, p90: 10, max: 11 });
    expect(spread([null, undefined])).toBeNull();
  });
});
