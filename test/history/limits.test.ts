import { describe, expect, it } from 'vitest';
import { defaultPolicy } from '../../harness/gate/defaults.js';
import { gate } from '../../harness/gate/gate.js';
import { generateNight } from '../../harness/history/generate.js';
import { gateLimit } from '../../harness/history/limits.js';
import type { ResultsFile, RunResult } from '../../harness/results/types.js';
import type { ScoreMetrics } from '../../harness/score/types.js';

const night = generateNight({ nights: 1, scenarios: 1, builds: 1, seed: 2 }, 0);
const policy = defaultPolicy();

function withMetrics(change: (m: ScoreMetrics) => void): ResultsFile {
  const run = structuredClone(night.runs[0]) as RunResult;
  change(run.metrics as ScoreMetrics);
  return { ...night, runs: [run] };
}

function brokenMetrics(base: ResultsFile, cand: ResultsFile): string[] {
  return gate({ baseline: base, candidate: cand, policy }).rows.filter((r) => r.broken).map((r) => r.metric);
}

const EPS = 1e-6;
type Case = { metric: string; reference: number; set: (m: ScoreMetrics, v: number) => void };
const cases: Case[] = [
  { metric: 'stanceMargin.min', reference: 0.4, set: (m, v) => (m.stanceMargin!.min = v) },
  { metric: 'stanceMargin.p05', reference: 0.45, set: (m, v) => (m.stanceMargin!.p05 = v) },
  { metric: 'slipDistance_m', reference: 0.004, set: (m, v) => (m.slipDistance_m = v) },
  { metric: 'slipDistance_m', reference: 0.2, set: (m, v) => (m.slipDistance_m = v) },
  { metric: 'violations.commanded', reference: 0, set: (m, v) => (m.violations.commanded = v) },
];

describe("the trend page's gate lines", () => {
  for (const c of cases) {
    it(`${c.metric} from ${c.reference}: the gate holds just inside the line and blocks just beyond it`, () => {
      const limit = gateLimit(c.metric, c.reference, policy.rules);
      expect(limit).not.toBeNull();
      if (limit === null) return;
      const base = withMetrics((m) => c.set(m, c.reference));
      const step = c.metric === 'violations.commanded' ? 1 : EPS;
      const inside = limit.breaks === 'below' ? limit.value + step : limit.value - (c.metric === 'violations.commanded' ? 0 : step);
      const beyond = limit.breaks === 'below' ? limit.value - step : limit.value + step;
      expect(brokenMetrics(base, withMetrics((m) => c.set(m, inside)))).not.toContain(c.metric);
      expect(brokenMetrics(base, withMetrics((m) => c.set(m, beyond)))).toContain(c.metric);
    });
  }

  it('loopTime_us.p99: no line by default (a single pass is not gated), the growth line when the policy sets one', () => {
    expect(gateLimit('loopTime_us.p99', 9, policy.rules)).toBeNull();
    const gated = { ...policy.rules, loopTimeP99GrowthFraction: 0.25 };
    expect(gateLimit('loopTime_us.p99', 9, gated)).toMatchObject({ value: 11.25, breaks: 'above' });
  });

  it('fell: a night that falls where the first stood breaks "no new falls"; none is drawn once the first fell', () => {
    expect(gateLimit('fell', 0, policy.rules)).toMatchObject({ value: 0, breaks: 'above' });
    expect(gateLimit('fell', 1, policy.rules)).toBeNull();
    const fallen = withMetrics((m) => {
      m.fell = true;
      m.fellAt_s = 0.5;
      m.fallReason = 'trunkLow';
    });
    expect(brokenMetrics(night, fallen)).toContain('fell');
  });
});
