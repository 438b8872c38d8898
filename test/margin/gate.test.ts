import { describe, expect, it } from 'vitest';
import { defaultPolicy } from '../../harness/gate/defaults.js';
import { gate } from '../../harness/gate/gate.js';
import type { MarginSearchRecord, RunMargin } from '../../harness/results/margin.js';
import type { RunResult } from '../../harness/results/types.js';
import { scenarioHash } from '../../harness/scenario/canonical.js';
import type { ResolvedScenario } from '../../harness/scenario/types.js';
import { results, scoredRun, stand } from '../gate/fixtures.js';
import { makeScenario } from '../score/fixtures.js';

function member(k: number, samples: number): ResolvedScenario {
  const s = makeScenario({ id: `shove-family-s${String(k).padStart(2, '0')}`, family: { id: 'shove-family', sample: k, samples, params: { frictionScale: 0.5 + k / 100 } } });
  return { ...s, hash: scenarioHash(s) };
}

/** A family of n samples for one build: the first `passes` stand, the rest fall (a real failure). */
function familyRuns(build: string, n: number, passes: number): RunResult[] {
  return Array.from({ length: n }, (_, i) => scoredRun(member(i + 1, n), build, i < passes ? {} : { fallAt: 500 }));
}

function search(criticalScale: number | null, outcome: MarginSearchRecord['outcome'] = 'found'): MarginSearchRecord {
  return { outcome, criticalScale, bracket: null, range: [0.05, 1], tolerance: 0.01, monotone: true, runs: 11, bisectionRuns: 7, wall_s: 1, samples: [] };
}

function withMargin(run: RunResult, friction: number | null, push: number | null = null): RunResult {
  const margin: RunMargin = {
    friction: { ...search(friction, friction === null ? 'failsWholeRange' : 'found'), lowestStaticFriction: 0.9, criticalStaticFriction: friction === null ? null : friction * 0.9 },
    push: push === null ? null : { ...search(push), range: [1, 3], peakForce_N: 60, criticalPeakForce_N: push * 60 },
    notes: [],
  };
  return { ...run, margin };
}

const policy = defaultPolicy();

describe('gate rule: critical friction scale', () => {
  it('blocks a rise beyond 0.03 although both runs pass as written, and holds a smaller one', () => {
    const base = results([withMargin(scoredRun(stand, 'main'), 0.5, 1.6)]);
    const small = gate({ baseline: base, candidate: results([withMargin(scoredRun(stand, 'branch'), 0.52, 1.6)]), policy });
    expect(small.verdict).toBe('hold');
    expect(small.rows.find((r) => r.metric === 'margin.criticalFrictionScale')).toMatchObject({ baseline: 0.5, candidate: 0.52, broken: false, rule: 'rise ≤ 0.03' });
    const large = gate({ baseline: base, candidate: results([withMargin(scoredRun(stand, 'branch'), 0.54, 1.6)]), policy });
    expect(large.verdict).toBe('block');
    const row = large.rows.find((r) => r.broken)!;
    expect(row.metric).toBe('margin.criticalFrictionScale');
    expect(row.reason).toMatch(/critical friction scale rose by 0\.040 \(0\.500 → 0\.540\), more than the 0\.03 allowed/);
    expect(large.rows.filter((r) => r.broken)).toHaveLength(1);
  });

  it('blocks a candidate that fails at every friction searched, and a lost push margin', () => {
    const base = results([withMargin(scoredRun(stand, 'main'), 0.5, 1.6)]);
    const lost = gate({ baseline: base, candidate: results([withMargin(scoredRun(stand, 'branch'), null, 1.6)]), policy });
    expect(lost.rows.find((r) => r.broken)?.reason).toMatch(/fails even at the top of the searched range/);
    const weaker = gate({ baseline: base, candidate: results([withMargin(scoredRun(stand, 'branch'), 0.5, 1.5)]), policy });
    expect(weaker.rows.find((r) => r.broken)).toMatchObject({ metric: 'margin.criticalPushScale', rule: 'drop ≤ 0.05' });
  });

  it('follows per-scenario overrides of the allowance', () => {
    const base = results([withMargin(scoredRun(stand, 'main'), 0.5)]);
    const cand = results([withMargin(scoredRun(stand, 'branch'), 0.54)]);
    const lenient = { ...policy, overrides: { [stand.id]: { criticalFrictionScaleRise: 0.05 } } };
    expect(gate({ baseline: base, candidate: cand, policy: lenient }).verdict).toBe('hold');
  });
});

describe('gate rule: family success rate (Newcombe 1998 interval of the drop)', () => {
  it('blocks a drop with statistical support: 9/10 → 3/10', () => {
    const outcome = gate({ baseline: results(familyRuns('main', 10, 9)), candidate: results(familyRuns('branch', 10, 3)), policy });
    expect(outcome.verdict).toBe('block');
    const broken = outcome.rows.filter((r) => r.broken);
    // Only the family row: its samples are not gated one by one (no "new fall" per sample).
    expect(broken).toHaveLength(1);
    expect(broken[0]).toMatchObject({ scenario: 'shove-family', metric: 'family.successRate', baseline: 0.9, candidate: 0.3 });
    // Newcombe method 10 for 9/10 − 3/10 at 95 %: [0.171, 0.809] (proportion.test.ts checks the method).
    expect(broken[0].reason).toMatch(/\[0\.17, 0\.81\] lies above 0/);
  });

  it('reports a small unsupported drop as within noise: 8/10 → 7/10', () => {
    const outcome = gate({ baseline: results(familyRuns('main', 10, 8)), candidate: results(familyRuns('branch', 10, 7)), policy });
    expect(outcome.verdict).toBe('hold');
    const row = outcome.rows.find((r) => r.metric === 'family.successRate')!;
    expect(row.broken).toBe(false);
    expect(row.change).toMatch(/^−0\.10 \(within noise: 95 % interval of the drop \[-?0\.\d\d, 0\.\d\d\]\)$/);
  });

  it('lists families whose samples differ as not comparable', () => {
    const outcome = gate({ baseline: results(familyRuns('main', 10, 8)), candidate: results(familyRuns('branch', 10, 8).slice(0, 9)), policy });
    expect(outcome.notComparable.some((n) => n.scenario === 'shove-family')).toBe(true);
  });
});
