// Hand-written margin searches and family scores laid onto the small real run of support.ts, for
// the margin section's tests (margin.test.ts, browser.test.ts). Validated against the results schema.
import type { FamilySummary, FrictionMarginRecord, MarginSample, PushMarginRecord } from '../../harness/results/margin.js';
import { wilsonInterval } from '../../harness/score/proportion.js';
import type { ResultsFile } from '../../harness/results/types.js';
import { validateResults } from '../../harness/results/validate.js';

export const HOSTILE_REASON = 'slip <script>alert(5)</script> & more';
export const HOSTILE_FAMILY = '<img src=x onerror=alert(6)>';

const sample = (scale: number, status: MarginSample['status'], role: MarginSample['role'], reasons: string[] = []): MarginSample => ({
  scale,
  status,
  role,
  slipDistance_m: status === 'pass' ? 0.01 : 0.2,
  frictionMarginMin: status === 'pass' ? 0.05 : -0.02,
  fell: false,
  reasons: status === 'pass' ? [] : reasons.length > 0 ? reasons : ['slip distance 0.2 m > 0.04 m'],
});

// A clean search: passes at ×1, bisected down to a bracket [0.6, 0.625].
function cleanFriction(): FrictionMarginRecord {
  const samples = [
    sample(1, 'pass', 'nominal'),
    sample(0.05, 'fail', 'end', [HOSTILE_REASON]),
    sample(0.525, 'fail', 'bisection'),
    sample(0.7625, 'pass', 'bisection'),
    sample(0.64375, 'pass', 'bisection'),
    sample(0.584375, 'fail', 'bisection'),
    sample(0.3, 'fail', 'check'),
  ];
  return {
    outcome: 'found', criticalScale: 0.64375, bracket: { failing: 0.584375, passing: 0.64375 }, range: [0.05, 1], tolerance: 0.01, monotone: true,
    runs: samples.length, bisectionRuns: 4, wall_s: 1.2, samples, lowestStaticFriction: 0.4, criticalStaticFriction: 0.64375 * 0.4,
  };
}

// A boundary that is not monotone: passes at 0.3, fails at 0.35, passes at 0.4 and above.
function wobblyFriction(): FrictionMarginRecord {
  const samples = [sample(1, 'pass', 'nominal'), sample(0.05, 'fail', 'end'), sample(0.3, 'pass', 'check'), sample(0.35, 'fail', 'check'), sample(0.4, 'pass', 'bisection')];
  return {
    outcome: 'found', criticalScale: 0.4, bracket: { failing: 0.35, passing: 0.4 }, range: [0.05, 1], tolerance: 0.01, monotone: false,
    runs: samples.length, bisectionRuns: 1, wall_s: 0.8, samples, lowestStaticFriction: 0.4, criticalStaticFriction: 0.16,
  };
}

// Fails as written and at every scale searched above it.
function hopelessFriction(): FrictionMarginRecord {
  const samples = [sample(1, 'fail', 'nominal'), sample(3, 'fail', 'end'), sample(2, 'error', 'check')];
  return {
    outcome: 'failsWholeRange', criticalScale: null, bracket: null, range: [1, 3], tolerance: 0.01, monotone: true,
    runs: samples.length, bisectionRuns: 0, wall_s: 0.5, samples, lowestStaticFriction: 0.4, criticalStaticFriction: null,
  };
}

function push(): PushMarginRecord {
  const samples = [sample(1, 'pass', 'nominal'), sample(3, 'fail', 'end'), sample(2, 'pass', 'bisection'), sample(2.5, 'fail', 'bisection')];
  return {
    outcome: 'found', criticalScale: 2, bracket: { failing: 2.5, passing: 2 }, range: [1, 3], tolerance: 0.01, monotone: true,
    runs: samples.length, bisectionRuns: 2, wall_s: 0.4, samples, peakForce_N: 80, criticalPeakForce_N: 160,
  };
}

function family(build: string, successes: number, runs: number): FamilySummary {
  const interval = wilsonInterval(successes, runs, 0.95);
  const spread = { count: runs, min: 0.001, p10: 0.002, median: 0.01, p90: 0.03, max: 0.05 };
  return {
    id: HOSTILE_FAMILY, build, file: 'scenarios/family.yaml', samples: runs, runs, successes, errors: 0, successRate: successes / runs,
    interval: { method: 'wilson', confidence: 0.95, lower: interval.lower, upper: interval.upper }, hash: 'a'.repeat(64),
    frictionMarginMin: spread, slipDistance_m: spread,
  };
}

/**
 * A copy of `plain` with margin searches on every run (clean on the shaped floor, a whole-range
 * failure and a non-monotone boundary on the hostile title, notes on the crashing build) and one
 * family scored 7/10 and 10/10.
 */
export function withMarginData(plain: ResultsFile): ResultsFile {
  const copy = structuredClone(plain) as ResultsFile;
  for (const run of copy.runs) {
    if (run.build === 'broken') {
      run.margin = { friction: null, push: null, notes: ['no margin search: the nominal run errored'] };
    } else if (run.scenario.id === 'hostile-title') {
      run.margin = { friction: run.build === 'nominal' ? hopelessFriction() : wobblyFriction(), push: null, notes: ['no push search: the scenario has no pushes'] };
    } else {
      run.margin = { friction: cleanFriction(), push: run.build === 'governed' ? push() : null, notes: [] };
    }
  }
  copy.families = [family('nominal', 7, 10), family('governed', 10, 10)];
  const checked = validateResults(copy);
  if (!checked.ok) throw new Error(`hand-written margin results do not validate: ${JSON.stringify(checked.issues)}`);
  return checked.value;
}
