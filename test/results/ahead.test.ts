import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { runSuite } from '../../harness/commands/run.js';
import { DEFAULT_GATE_RULES } from '../../harness/gate/defaults.js';
import { aheadBuilds, aheadTable, DEFAULT_AHEAD_ALLOWANCES, judgeAhead, stanceMarginMin, verdictOf } from '../../harness/results/ahead.js';
import { createResultsFile, createErrorRunResult } from '../../harness/results/runResult.js';
import { isSlippery, lowestStaticFriction, SLIPPERY_STATIC_FRICTION } from '../../harness/results/slippery.js';
import { validateResults } from '../../harness/results/validate.js';
import { renderAheadMarkdown } from '../../harness/results/writeSummary.js';
import type { BuildManifest } from '../../harness/results/types.js';
import { makeScenario } from '../score/fixtures.js';
import { MACHINE, scoredRun } from './fixtures.js';

// The fixture floor is μs 0.5 and its standing sample loads foot 0 with 32 N: a tangential force
// fx gives the stance margin 1 − fx/(0.5·32), a foot speed v over the 1 s run a slip of v·1 s.
const scenario = makeScenario({
  id: 'wet-test-walk',
  acceptance: { mustNotFall: true, minFrictionMargin: 0.2, maxSlipDistance_m: 0.05, maxCommandedViolations: 0, minProgress: null },
});

describe('ahead: the rule on one scenario', () => {
  it('a better verdict is ahead whatever the numbers; a worse one never is', () => {
    const passing = scoredRun(scenario, 'a', { fx_N: 4, v_mps: 0.04 }); // margin 0.75, slip 0.04 m
    const failing = scoredRun(scenario, 'b', { fx_N: 1, v_mps: 0.06 }); // margin 0.94, slip 0.06 m > 0.05
    expect([passing.status, failing.status]).toEqual(['pass', 'fail']);
    expect(judgeAhead(passing, failing)).toEqual({ ahead: true, reason: 'better verdict' });
    expect(judgeAhead(failing, passing)).toEqual({ ahead: false, reason: 'worse verdict' });
  });

  it('ranks error below a fall below a failed check below a pass', () => {
    const fell = scoredRun(scenario, 'a', { fallAt: 500 });
    const failed = scoredRun(scenario, 'b', { fx_N: 14 }); // margin 0.125 < 0.2
    const errored = createErrorRunResult(scenario, 'c', { message: 'crashed' });
    expect([verdictOf(errored), verdictOf(fell), verdictOf(failed)]).toEqual(['error', 'fell', 'fail']);
    expect(judgeAhead(failed, fell).reason).toBe('better verdict');
    expect(judgeAhead(fell, errored).reason).toBe('better verdict');
    expect(judgeAhead(errored, errored)).toEqual({ ahead: false, reason: 'not measured' });
  });

  it('on equal verdicts: ahead on slip smaller by more than both gate allowances, at a margin no lower less 0.02', () => {
    // Both fail the margin check (fx 14 N: margin 0.125), so slip and margin decide.
    const little = scoredRun(scenario, 'a', { fx_N: 14, v_mps: 0.01 }); // 0.010 m
    const much = scoredRun(scenario, 'b', { fx_N: 14, v_mps: 0.03 }); //   0.030 m: +0.02 m and +200 %
    const bitMore = scoredRun(scenario, 'c', { fx_N: 14, v_mps: 0.019 }); // +0.009 m ≤ 0.01 m
    expect(judgeAhead(little, much)).toEqual({ ahead: true, reason: 'less slip' });
    expect(judgeAhead(much, little)).toEqual({ ahead: false, reason: 'not less slip' });
    expect(judgeAhead(little, bitMore)).toEqual({ ahead: false, reason: 'not less slip' });
  });

  it('less slip bought with a lower stance margin is not ahead', () => {
    const lowMargin = scoredRun(scenario, 'a', { fx_N: 15, v_mps: 0.01 }); // margin 0.0625
    const highMargin = scoredRun(scenario, 'b', { fx_N: 14, v_mps: 0.03 }); // margin 0.125: 0.0625 more > 0.02
    const nearMargin = scoredRun(scenario, 'c', { fx_N: 14.5, v_mps: 0.03 }); // margin 0.09375: 0.03125 more
    expect(stanceMarginMin(lowMargin)).toBeCloseTo(0.0625, 9);
    expect(judgeAhead(lowMargin, highMargin)).toEqual({ ahead: false, reason: 'lower margin' });
    expect(judgeAhead(lowMargin, nearMargin)).toEqual({ ahead: false, reason: 'lower margin' });
    // A looser margin allowance (a policy's) lets the same pair count.
    expect(judgeAhead(lowMargin, highMargin, { ...DEFAULT_AHEAD_ALLOWANCES, frictionMarginMinLoss: 0.07 }).ahead).toBe(true);
  });

  it('its default allowances are the gate default policy', () => {
    expect(DEFAULT_AHEAD_ALLOWANCES).toEqual({
      frictionMarginMinLoss: DEFAULT_GATE_RULES.frictionMarginMinLoss,
      slipDistanceGrowth_m: DEFAULT_GATE_RULES.slipDistanceGrowth_m,
      slipDistanceGrowthFraction: DEFAULT_GATE_RULES.slipDistanceGrowthFraction,
    });
  });
});

describe('slippery: the lowest static friction of a scenario', () => {
  it('takes the minimum over default material, patches and raster cells; ≤ 0.6 is slippery', () => {
    const friction = structuredClone(scenario.plant.ground.friction);
    friction.default.staticFriction = 0.9;
    expect(lowestStaticFriction(friction)).toBe(0.9);
    friction.patches.push({ name: 'wet', shape: { kind: 'rect', min_m: [0, 0], max_m: [1, 1] }, material: { ...friction.default, staticFriction: 0.4, kineticFriction: 0.3 } });
    expect(lowestStaticFriction(friction)).toBe(0.4);
    friction.raster = { origin_m: [0, 0], cell_m: 0.5, staticFriction: [[0.9, 0.3], [0.9, 0.9]], kineticFriction: [[0.7, 0.2], [0.7, 0.7]] };
    expect(lowestStaticFriction(friction)).toBe(0.3);
    expect([isSlippery(SLIPPERY_STATIC_FRICTION), isSlippery(0.61)]).toEqual([true, false]);
  });

  it('is recorded with each run', () => {
    expect(scoredRun(scenario, 'a').scenario.lowestStaticFriction).toBe(0.5);
  });
});

describe('ahead: which builds, and the table', () => {
  const reference = (name: string, entry: string, options: Record<string, unknown> = {}): BuildManifest => ({ name, kind: 'reference', entry, options });
  const results = (builds: BuildManifest[]) =>
    createResultsFile({
      toolVersion: '0.1.0',
      startedAt: '2030-01-02T03:04:05.000Z',
      machine: MACHINE,
      builds,
      runs: [scoredRun(scenario, 'gov', { fx_N: 4 }), scoredRun(scenario, 'nom', { fx_N: 14, v_mps: 0.1 })],
    });

  it('takes the baseline build against ref:nominal, else the governed reference build', () => {
    const both = results([reference('gov', 'governed'), reference('nom', 'nominal')]);
    expect(aheadBuilds(both, 'gov')).toEqual({ leader: 'gov', other: 'nom' });
    expect(aheadBuilds(both)).toEqual({ leader: 'gov', other: 'nom' });
    expect(aheadBuilds(both, 'nom')).toEqual({ missing: 'the baseline build nom is the nominal reference build itself' });
    expect(aheadBuilds(results([reference('gov', 'governed'), reference('nom', 'nominal', { trust: 2 })]), 'gov')).toEqual({ missing: 'the nominal reference build (ref:nominal) did not run' });
    const noBaseline = results([{ name: 'gov', kind: 'module', entry: 'x.js' }, reference('nom', 'nominal')]);
    expect(renderAheadMarkdown(noBaseline).join('\n')).toMatch(/No ahead table: no baseline build was named \(--baseline\) and the governed reference build did not run\./);
  });

  it('lists slippery scenarios only, and counts', () => {
    const table = aheadTable(results([reference('gov', 'governed'), reference('nom', 'nominal')]), 'gov', 'nom');
    expect(table.rows.map((r) => [r.scenario, r.judgement.reason])).toEqual([['wet-test-walk', 'better verdict']]);
    const dry = makeScenario({ id: 'dry-test-walk', hash: 'b'.repeat(64) });
    dry.plant.ground.friction.default.staticFriction = 0.9;
    const withDry = createResultsFile({
      toolVersion: '0.1.0',
      machine: MACHINE,
      builds: [reference('gov', 'governed'), reference('nom', 'nominal')],
      runs: [scoredRun(dry, 'gov'), scoredRun(dry, 'nom', { fx_N: 14 }), scoredRun(scenario, 'gov')],
    });
    const text = renderAheadMarkdown(withDry, { baseline: 'gov' }).join('\n');
    expect(text).not.toContain('dry-test-walk');
    expect(text).toContain('gov ahead of nom on 0 of 0 slippery scenarios');
    expect(text).toContain('Not compared (run by one of the two builds only): `wet-test-walk`');
  });
});

describe('ahead table on a small run', () => {
  const dir = mkdtempSync(path.join(tmpdir(), 'footing-ahead-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it('summary.md shows governed vs nominal on the slippery hall and leaves the dry one out', async () => {
    const scenarios = path.resolve(import.meta.dirname, '../../scenarios/hall-friction-matrix.yaml');
    const outcome = await runSuite({
      paths: [scenarios],
      builds: ['ref:nominal', 'ref:governed'],
      baseline: 'governed',
      outDir: dir,
      selection: { grep: '^hall-friction-0p(2|9)$' },
      jobs: 1,
      quiet: true,
      log: () => {},
    });
    expect(outcome.results?.runs).toHaveLength(4);
    const summary = readFileSync(path.join(dir, 'summary.md'), 'utf8');
    // μs 0.2: nominal slides (it fails its margin check, docs/reference-controllers.md); 0.9 is dry.
    expect(summary).toMatch(/\| hall-friction-0p2 \| 0\.20 \| pass \| fail \| [0-9.]+ \| -?0\.0\d\d \| [0-9.]+ \| [0-9.]+ \| ahead \(better verdict\) \|/);
    expect(summary).not.toMatch(/\| hall-friction-0p9 \| 0\.90/);
    expect(summary).toContain('governed ahead of nominal on 1 of 1 slippery scenarios');
  }, 120_000);
});

describe('ahead: results written before lowestStaticFriction', () => {
  it('still validate, and their summary has no slippery scenario to count', () => {
    const old = createResultsFile({
      toolVersion: '0.1.0',
      machine: MACHINE,
      builds: [{ name: 'gov', kind: 'reference', entry: 'governed', options: {} }, { name: 'nom', kind: 'reference', entry: 'nominal', options: {} }],
      runs: [scoredRun(scenario, 'gov'), scoredRun(scenario, 'nom', { fx_N: 14 })],
    });
    for (const run of old.runs) delete run.scenario.lowestStaticFriction;
    expect(validateResults(JSON.parse(JSON.stringify(old))).ok).toBe(true);
    const text = renderAheadMarkdown(old, { baseline: 'gov' }).join('\n');
    expect(text).toContain('gov ahead of nom on 0 of 0 slippery scenarios');
    expect(text).toContain('Not judged: 2 runs without `lowestStaticFriction` (written before it was recorded).');
  });
});
