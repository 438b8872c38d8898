import { describe, expect, it } from 'vitest';
import { evaluateAcceptance } from '../../harness/score/acceptance.js';
import { formatPair } from '../../harness/score/format.js';
import { createScorer } from '../../harness/score/scorer.js';
import type { Acceptance } from '../../harness/scenario/types.js';
import type { ScoreMetrics } from '../../harness/score/types.js';
import { drive, makeScenario, standingSample } from './fixtures.js';

function baseMetrics(): ScoreMetrics {
  const scorer = createScorer(makeScenario());
  drive((s) => scorer.record(s), standingSample(), 10);
  return scorer.finish({ wall_s: 1 }).metrics;
}

const none: Acceptance = {
  mustNotFall: false,
  minFrictionMargin: null,
  maxSlipDistance_m: null,
  maxCommandedViolations: null,
  minProgress: null,
};

describe('evaluateAcceptance', () => {
  it('passes with no reasons when every check holds', () => {
    const all: Acceptance = { mustNotFall: true, minFrictionMargin: 0.1, maxSlipDistance_m: 0.05, maxCommandedViolations: 0, minProgress: null };
    expect(evaluateAcceptance(all, baseMetrics())).toEqual({ status: 'pass', reasons: [] });
  });

  it('writes one sentence per broken check', () => {
    const m = baseMetrics();
    m.fell = true;
    m.fellAt_s = 3.4217;
    m.fallReason = 'trunkTilted';
    m.stanceMargin!.min = 0.0123; // the acceptance margin check judges the stance margin
    m.slipDistance_m = 0.3104;
    m.violations.commanded = 3;
    m.progress = 0.42;
    const outcome = evaluateAcceptance(
      { mustNotFall: true, minFrictionMargin: 0.05, maxSlipDistance_m: 0.05, maxCommandedViolations: 0, minProgress: 0.8 },
      m,
    );
    expect(outcome.status).toBe('fail');
    expect(outcome.reasons).toEqual([
      'fell at 3.42 s (trunk tilted beyond 60°)',
      'stance friction margin 0.01 < 0.05',
      'slip distance 0.31 m > 0.05 m',
      '3 commanded friction-cone violations > 0 allowed',
      'progress 0.42 < 0.80 of the commanded travel',
    ]);
  });

  it('ignores checks that are null or off', () => {
    const m = baseMetrics();
    m.fell = true;
    m.slipDistance_m = 9;
    expect(evaluateAcceptance(none, m).status).toBe('pass');
  });

  it('fails a check it cannot measure, saying why', () => {
    const m = baseMetrics();
    m.stanceMargin!.min = null;
    m.progress = null;
    expect(evaluateAcceptance({ ...none, minFrictionMargin: 0, minProgress: 0.5 }, m).reasons).toEqual([
      'stance friction margin not measured: no foot was ever loaded in stance',
      'progress not measured: the scenario commands no travel',
    ]);
  });
});

describe('formatPair', () => {
  it('adds decimals until a value and its limit read differently', () => {
    expect(formatPair(0.31, 0.05)).toEqual(['0.31', '0.05']);
    expect(formatPair(0.0043, 0.001)).toEqual(['0.004', '0.001']);
    expect(formatPair(0.0500001, 0.05)).toEqual(['0.050000', '0.050000']);
    expect(formatPair(-0.0001, 0)).toEqual(['-0.0001', '0.0000']);
  });
});
