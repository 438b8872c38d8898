import { describe, expect, it } from 'vitest';
import { defaultPolicy, type GatePolicy } from '../../harness/gate/defaults.js';
import { gate, gateWithinResults } from '../../harness/gate/gate.js';
import { GateInputError, type GateRow } from '../../harness/gate/types.js';
import { createRunResult } from '../../harness/results/runResult.js';
import { createScorer } from '../../harness/score/scorer.js';
import { drive, makeScenario, standingSample } from '../score/fixtures.js';
import { errorRun, results, scoredRun, stand, walk, walkChanged } from './fixtures.js';

// Foot 0 carries f_n = 32 N on μs = 0.5 (capacity 16 N) for 1000 ticks of 1 ms, so a tangential
// force fx gives margin 1 − fx/16 and a foot speed v gives slip distance v × 1 s.

function one(base: Parameters<typeof scoredRun>[2], cand: Parameters<typeof scoredRun>[2], policy: GatePolicy = defaultPolicy()) {
  return gate({ baseline: results([scoredRun(walk, 'main', base)]), candidate: results([scoredRun(walk, 'branch', cand)]), policy });
}

/**
 * A released start: all four feet land at the first 1 ms tick (four touchdowns) and foot 0 slides
 * at `v_mps` through its 20 ms transient, so the mean slip per touchdown is v × 0.02 s / 4.
 */
function landingRun(build: string, v_mps: number) {
  const base = makeScenario({ id: 'ice-walk' });
  const scenario = makeScenario({ id: 'ice-walk', plant: { ...base.plant, initial: { ...base.plant.initial, start: 'released' } } });
  const scorer = createScorer(scenario);
  drive((s) => scorer.record(s), standingSample(), 200, (s, k) => s.footVelocity_mps.set([k < 20 ? v_mps : 0, 0, 0], 0));
  return createRunResult(scenario, build, scorer.finish({ wall_s: 0.2 }));
}

function rowFor(rows: GateRow[], metric: string): GateRow | undefined {
  return rows.find((r) => r.metric === metric);
}

describe('gate rules', () => {
  it('blocks slip per touchdown grown by more than both 0.5 mm and 20 %, not by one alone', () => {
    const landings = (v: number) => gate({ baseline: results([landingRun('main', 0.02)]), candidate: results([landingRun('branch', v)]), policy: defaultPolicy() });
    // 0.1 mm per touchdown → 0.6 mm: +0.5 mm exactly (allowed, the slack) though +500 %.
    const small = rowFor(landings(0.12).rows, 'touchdown.slip_m.mean')!;
    expect(small).toMatchObject({ broken: false, baseline: 0.0001, rule: 'growth ≤ +20 % or ≤ +0.0005 m' });
    expect(small.candidate as number).toBeCloseTo(0.0006, 15);
    // → 0.8 mm: +0.7 mm and +700 %: blocks.
    const outcome = landings(0.16);
    expect(outcome.verdict).toBe('block');
    const grown = rowFor(outcome.rows, 'touchdown.slip_m.mean')!;
    expect(grown.broken).toBe(true);
    expect(grown.reason).toBe('slip per touchdown grew from 0.000100 m to 0.000800 m, more than both +20 % and +0.0005 m');
  });

  it('holds identical runs with no rows', () => {
    const outcome = one({ fx_N: 4 }, { fx_N: 4 });
    expect(outcome).toMatchObject({ verdict: 'hold', rows: [], compared: 1, buildPairs: [['main', 'branch']] });
  });

  it('blocks a friction-margin loss beyond 0.02 and names it', () => {
    // 0.75 → 1 − 4.5/16 = 0.71875: loss 0.03125 > 0.02.
    const outcome = one({ fx_N: 4 }, { fx_N: 4.5 });
    expect(outcome.verdict).toBe('block');
    const min = rowFor(outcome.rows, 'stanceMargin.min')!;
    expect(min).toMatchObject({ broken: true, baseline: 0.75, candidate: 0.71875, change: '−0.031', rule: 'loss ≤ 0.02' });
    expect(min.reason).toBe('stance friction margin min fell by 0.031 (0.750 → 0.719), more than the 0.02 allowed');
    expect(rowFor(outcome.rows, 'stanceMargin.p05')!.broken).toBe(true);
  });

  it('holds a friction-margin loss within 0.02 but still shows it moved', () => {
    // 0.75 → 1 − 4.24/16 = 0.735: loss 0.015.
    const outcome = one({ fx_N: 4 }, { fx_N: 4.24 });
    expect(outcome.verdict).toBe('hold');
    expect(rowFor(outcome.rows, 'stanceMargin.min')).toMatchObject({ broken: false, change: '−0.015' });
  });

  it('treats a loss of exactly the allowance as held', () => {
    // 0.75 → 0.73 (fx = 4.32 N): loss 0.02 up to rounding.
    expect(one({ fx_N: 4 }, { fx_N: 4.32 }).verdict).toBe('hold');
  });

  it('blocks slip growth only when it exceeds both +20 % and +0.01 m', () => {
    const slip = (b: number, c: number) => rowFor(one({ v_mps: b }, { v_mps: c }).rows, 'slipDistance_m')!;
    expect(slip(0.05, 0.065).broken).toBe(true); // +30 %, +0.015 m
    expect(slip(0.05, 0.058).broken).toBe(false); // +16 %, +0.008 m
    expect(slip(0.1, 0.115).broken).toBe(false); // +15 % only the absolute exceeded
    expect(slip(0.001, 0.005).broken).toBe(false); // +400 % but +0.004 m
    expect(slip(0.05, 0.065).change).toBe('+0.0150 m (+30 %)');
  });

  it('blocks a new fall but not a fall the baseline also had', () => {
    const fresh = one({}, { fallAt: 500 });
    expect(rowFor(fresh.rows, 'fell')).toMatchObject({ broken: true, baseline: false, candidate: 0.501, change: 'no → at 0.50 s' });
    expect(rowFor(fresh.rows, 'fell')!.reason).toBe('candidate fell at 0.50 s (trunk centre below 40 % of standing height); the baseline did not fall');
    const both = one({ fallAt: 600 }, { fallAt: 500 });
    expect(rowFor(both.rows, 'fell')).toMatchObject({ broken: false });
  });

  it('blocks new commanded violations unless the scenario override allows them', () => {
    expect(rowFor(one({}, { wantedFx_N: 20 }).rows, 'violations.commanded')).toMatchObject({ broken: true, change: '0 → 1' });
    const policy = defaultPolicy();
    policy.overrides['ice-walk'] = { allowNewCommandedViolations: true };
    const row = rowFor(one({}, { wantedFx_N: 20 }, policy).rows, 'violations.commanded')!;
    expect(row).toMatchObject({ broken: false, rule: null });
    // Fewer violations than the baseline is progress, not a breach.
    expect(rowFor(one({ wantedFx_N: 20 }, {}).rows, 'violations.commanded')!.broken).toBe(false);
  });

  it('reports a single pass\'s loop-time p99 without gating it, unless the policy sets a growth fraction', () => {
    // One pass's p99 moves with the machine's load; by default it is information only.
    const loop = (b: number, c: number, policy?: GatePolicy) => rowFor(one({ loop_us: b }, { loop_us: c }, policy).rows, 'loopTime_us.p99')!;
    expect(loop(100, 300)).toMatchObject({ broken: false, rule: null });
    expect(loop(900, 1050)).toMatchObject({ broken: false, rule: null }); // over budget: the paired measurement judges that
    const policy = defaultPolicy();
    policy.rules.loopTimeP99GrowthFraction = 0.25;
    expect(loop(100, 130, policy).broken).toBe(true); // +30 %
    expect(loop(100, 120, policy).broken).toBe(false); // +20 %
  });

  it('blocks a candidate run that errored as a new failure, naming the error', () => {
    const outcome = gate({ baseline: results([scoredRun(walk, 'main')]), candidate: results([errorRun('branch')]), policy: defaultPolicy() });
    expect(outcome.verdict).toBe('block');
    expect(outcome.rows[0]).toMatchObject({ metric: 'status', broken: true, blocking: true, runChange: 'new-failure', reason: 'new failure: errored: controller threw: bad gain (the baseline passed)' });
    expect(outcome.runChanges['new-failure']).toBe(1);
  });

  it('applies per-scenario overrides over the policy rules', () => {
    const policy = defaultPolicy();
    policy.overrides['ice-walk'] = { frictionMarginMinLoss: 0.05, frictionMarginP05Loss: 0.05 };
    expect(one({ fx_N: 4 }, { fx_N: 4.5 }, policy).verdict).toBe('hold');
    policy.overrides['no-such-scenario'] = { allowNewFalls: true };
    expect(one({ fx_N: 4 }, { fx_N: 4.5 }, policy).warnings).toEqual(['policy override for scenario "no-such-scenario" matched no compared run']);
  });
});

describe('only what the candidate changed blocks', () => {
  // Margin 0.75 everywhere below (fx 4 N on a 16 N capacity); this scenario asks for 0.9, so every
  // run of it fails acceptance on both sides.
  const strict = makeScenario({
    id: 'ice-walk',
    acceptance: { mustNotFall: true, minFrictionMargin: 0.9, maxSlipDistance_m: null, maxCommandedViolations: null, minProgress: null },
  });

  it('lists a scenario failing identically on both sides as still failing and holds', () => {
    const outcome = gate({ baseline: results([scoredRun(strict, 'main', { fx_N: 4 })]), candidate: results([scoredRun(strict, 'branch', { fx_N: 4 })]), policy: defaultPolicy() });
    expect(outcome.verdict).toBe('hold');
    expect(outcome.runChanges).toMatchObject({ 'still-failing': 1, 'new-failure': 0 });
    expect(rowFor(outcome.rows, 'status')).toMatchObject({ broken: true, preExisting: true, blocking: false, runChange: 'still-failing' });
    expect(rowFor(outcome.rows, 'status')!.reason).toBe('still failing: stance friction margin 0.75 < 0.90 (fails on the baseline too: stance friction margin 0.75 < 0.90)');
  });

  it('blocks the same still-failing scenario when the policy says still-failing runs block', () => {
    const policy = defaultPolicy();
    policy.rules.blockStillFailing = true;
    const outcome = gate({ baseline: results([scoredRun(strict, 'main', { fx_N: 4 })]), candidate: results([scoredRun(strict, 'branch', { fx_N: 4 })]), policy });
    expect(outcome.verdict).toBe('block');
  });

  it('still blocks a rule the candidate newly broke on a run that was failing already', () => {
    // 0.75 → 0.5 on a run failing on both sides: the margin loss is the candidate's own doing.
    const outcome = gate({ baseline: results([scoredRun(strict, 'main', { fx_N: 4 })]), candidate: results([scoredRun(strict, 'branch', { fx_N: 8 })]), policy: defaultPolicy() });
    expect(outcome.verdict).toBe('block');
    expect(outcome.rows[0]).toMatchObject({ metric: 'stanceMargin.min', blocking: true });
  });

  it('shows a run the candidate fixed, without blocking', () => {
    // fx 1 N: margin 1 − 1/16 = 0.9375 ≥ 0.9, so the candidate passes where the baseline failed.
    const outcome = gate({ baseline: results([scoredRun(strict, 'main', { fx_N: 4 })]), candidate: results([scoredRun(strict, 'branch', { fx_N: 1 })]), policy: defaultPolicy() });
    expect(outcome.verdict).toBe('hold');
    expect(outcome.runChanges.fixed).toBe(1);
    expect(rowFor(outcome.rows, 'status')).toMatchObject({ runChange: 'fixed', broken: false });
  });

  it('blocks a baseline scenario the candidate did not run, listed as not run', () => {
    const baseline = results([scoredRun(walk, 'main'), scoredRun(stand, 'main')]);
    const candidate = results([scoredRun(walk, 'branch')]);
    const outcome = gate({ baseline, candidate, policy: defaultPolicy() });
    expect(outcome.verdict).toBe('block');
    expect(outcome.rows[0]).toMatchObject({ scenario: 'quiet-stand', metric: 'coverage', candidate: 'not run', blocking: true });
    const allowed = defaultPolicy();
    allowed.rules.allowMissingRuns = true;
    expect(gate({ baseline, candidate, policy: allowed }).verdict).toBe('hold');
  });
});

describe('gate pairing', () => {
  it('pairs by equal build names when either side holds several builds', () => {
    const baseline = results([scoredRun(walk, 'a'), scoredRun(walk, 'b', { fx_N: 4 })]);
    const candidate = results([scoredRun(walk, 'b', { fx_N: 8 }), scoredRun(walk, 'c')]);
    const outcome = gate({ baseline, candidate, policy: defaultPolicy() });
    expect(outcome.buildPairs).toEqual([['b', 'b']]);
    expect(outcome.verdict).toBe('block');
    expect(outcome.unpaired).toEqual([
      { side: 'baseline', build: 'a', scenario: null, reason: 'no candidate build to pair with' },
      { side: 'candidate', build: 'c', scenario: null, reason: 'no baseline build to pair with' },
    ]);
  });

  it('uses explicit pairs and rejects a pair naming a missing build', () => {
    const baseline = results([scoredRun(walk, 'a'), scoredRun(walk, 'b')]);
    const candidate = results([scoredRun(walk, 'x', { fx_N: 8 }), scoredRun(walk, 'y')]);
    const outcome = gate({ baseline, candidate, policy: defaultPolicy(), pairs: [['a', 'x'], ['b', 'y']] });
    expect(outcome.compared).toBe(2);
    expect(outcome.rows.filter((r) => r.broken).every((r) => r.baselineBuild === 'a' && r.candidateBuild === 'x')).toBe(true);
    expect(() => gate({ baseline, candidate, policy: defaultPolicy(), pairs: [['a', 'z']] })).toThrow(GateInputError);
    expect(() => gate({ baseline, candidate, policy: defaultPolicy(), pairs: [['a', 'z']] })).toThrow('the candidate has no build "z" (it has: x, y)');
  });

  it('lists changed scenarios as not comparable instead of comparing them', () => {
    const outcome = gate({
      baseline: results([scoredRun(walk, 'main', { fx_N: 4 }), scoredRun(stand, 'main')]),
      candidate: results([scoredRun(walkChanged, 'branch', { fx_N: 15 }), scoredRun(stand, 'branch')]),
      policy: defaultPolicy(),
    });
    expect(outcome.verdict).toBe('hold');
    expect(outcome.compared).toBe(1);
    expect(outcome.notComparable).toEqual([
      {
        scenario: 'ice-walk',
        baselineBuild: 'main',
        candidateBuild: 'branch',
        baselineHash: 'a'.repeat(64),
        candidateHash: 'c'.repeat(64),
        reason: 'scenario changed (revision 1 → 2, hash aaaaaaaaaaaa → cccccccccccc)',
      },
    ]);
  });

  it('lists scenarios run on one side only, and baseline errors as not comparable', () => {
    const outcome = gate({
      baseline: results([errorRun('main'), scoredRun(makeId('old-only'), 'main')]),
      candidate: results([scoredRun(walk, 'branch'), scoredRun(makeId('new-only'), 'branch')]),
      policy: defaultPolicy(),
    });
    expect(outcome.compared).toBe(0);
    expect(outcome.notComparable[0].reason).toBe('baseline run errored: controller threw: bad gain');
    expect(outcome.unpaired).toEqual([
      { side: 'baseline', build: 'main', scenario: 'old-only', reason: 'not run by candidate build "branch"' },
      { side: 'candidate', build: 'branch', scenario: 'new-only', reason: 'not run by baseline build "main"' },
    ]);
  });

  it('gates the builds of one result set against a named baseline build', () => {
    const both = results([scoredRun(walk, 'main', { fx_N: 4 }), scoredRun(walk, 'candidate', { fx_N: 8 }), scoredRun(walk, 'other', { fx_N: 4 })]);
    const outcome = gateWithinResults(both, 'main', defaultPolicy());
    expect(outcome.buildPairs).toEqual([['main', 'candidate'], ['main', 'other']]);
    expect(outcome.unpaired).toEqual([]);
    expect(outcome.verdict).toBe('block');
    expect(() => gateWithinResults(both, 'nope', defaultPolicy())).toThrow('--baseline nope: no build of that name in this run (builds: main, candidate, other)');
  });
});

function makeId(id: string) {
  return { ...walk, id };
}
