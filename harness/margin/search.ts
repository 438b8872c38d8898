// The margin search on one knob (friction scale, push scale): where does the scenario's acceptance
// stop holding? Pure logic over a probe function, so it is tested with synthetic pass/fail
// functions and no simulation.
//
// 1. Probe the nominal scale (1: the scenario as written). Its outcome picks the half of the range
//    that holds the boundary: for friction (passes above the boundary) a pass searches
//    [lower, nominal], a fail [nominal, upper]; for pushes (passes below) the other way round.
// 2. Probe the far end of that half. Both ends alike: the boundary is outside the range.
// 3. Bisect until the bracket is no wider than the tolerance: ⌈log₂(range / tolerance)⌉ probes.
// 4. Probe `checks` more scales spread evenly inside the range. With the two ends these are the
//    monotonicity samples: a pass/fail boundary that is not one clean threshold (passes at 0.30,
//    fails at 0.35, passes at 0.40) shows up as a failing sample on the passing side, or the
//    reverse, and is reported as not monotone with every sample, never as one clean number.
//
// The critical scale is read off all samples conservatively: for friction the smallest passing
// scale above every failing one; for pushes the largest passing scale below every failing one.
// For a monotone boundary that is the passing end of the final bracket.

import type { ProbeStatus, SampleRole, SearchOutcomeKind, SearchResult, SearchSample } from '../results/margin.js';

export type SearchDirection = 'passAbove' | 'passBelow';

export interface SearchOptions {
  direction: SearchDirection;
  /** The scenario as written, normally 1. */
  nominal: number;
  lower: number;
  upper: number;
  tolerance: number;
  /** Extra monotonicity probes inside the range (the two ends are always probed). */
  checks: number;
}


export type Probe<D> = (scale: number) => Promise<{ status: ProbeStatus; detail: D }>;

/** Number of bisection probes that shrink `range` to `tolerance`: ⌈log₂(range / tolerance)⌉. */
export function bisectionCount(range: number, tolerance: number): number {
  if (range <= tolerance) return 0;
  return Math.ceil(Math.log2(range / tolerance) - 1e-12);
}

export function checkSearchOptions(o: SearchOptions): void {
  const finite = [o.nominal, o.lower, o.upper, o.tolerance].every(Number.isFinite);
  if (!finite || !(o.lower <= o.nominal && o.nominal <= o.upper && o.lower < o.upper)) {
    throw new RangeError(`margin search range [${o.lower}, ${o.upper}] must contain the nominal scale ${o.nominal} (expected lower ≤ nominal ≤ upper, lower < upper)`);
  }
  if (!(o.tolerance > 0)) throw new RangeError(`margin tolerance ${o.tolerance} must be above 0`);
  if (!Number.isInteger(o.checks) || o.checks < 0) throw new RangeError(`margin checks ${o.checks} must be a whole number ≥ 0`);
}

export async function searchBoundary<D>(probe: Probe<D>, options: SearchOptions): Promise<SearchResult<D>> {
  checkSearchOptions(options);
  const { direction, nominal, tolerance } = options;
  const samples: SearchSample<D>[] = [];
  const run = async (scale: number, role: SampleRole): Promise<boolean> => {
    const { status, detail } = await probe(scale);
    samples.push({ scale, status, role, detail });
    return status === 'pass';
  };

  const nominalPasses = await run(nominal, 'nominal');
  // The half that holds the boundary, given the nominal outcome.
  const searchBelow = direction === 'passAbove' ? nominalPasses : !nominalPasses;
  const range: [number, number] = searchBelow ? [options.lower, nominal] : [nominal, options.upper];
  const far = searchBelow ? range[0] : range[1];
  let bisectionRuns = 0;
  if (range[1] > range[0]) {
    const farPasses = await run(far, 'end');
    if (farPasses !== nominalPasses) {
      let passing = nominalPasses ? nominal : far;
      let failing = nominalPasses ? far : nominal;
      const slack = tolerance * 1e-9;
      while (Math.abs(passing - failing) > tolerance + slack) {
        const mid = (passing + failing) / 2;
        bisectionRuns++;
        if (await run(mid, 'bisection')) passing = mid;
        else failing = mid;
      }
    }
    for (let k = 1; k <= options.checks; k++) await run(range[0] + ((range[1] - range[0]) * k) / (options.checks + 1), 'check');
  }

  samples.sort((a, b) => a.scale - b.scale);
  return { ...judge(samples, direction, range), range, tolerance, runs: samples.length, bisectionRuns, samples };
}

/** Outcome, critical scale, bracket and monotonicity from a set of samples (sorted by scale). */
export function judge<D>(
  samples: SearchSample<D>[],
  direction: SearchDirection,
  range: [number, number],
): Pick<SearchResult<D>, 'outcome' | 'critical' | 'bracket' | 'monotone'> {
  const passes = (s: SearchSample<D>) => s.status === 'pass';
  // Walk from the passing side toward the failing side; the critical scale is the last pass
  // before the first fail. For passAbove the passing side is the high end.
  const ordered = direction === 'passAbove' ? [...samples].reverse() : samples;
  const firstFail = ordered.findIndex((s) => !passes(s));
  if (firstFail < 0) {
    return { outcome: 'passesWholeRange', critical: direction === 'passAbove' ? range[0] : range[1], bracket: null, monotone: true };
  }
  const monotone = ordered.slice(firstFail).every((s) => !passes(s));
  if (firstFail === 0) return { outcome: 'failsWholeRange', critical: null, bracket: null, monotone };
  const passing = ordered[firstFail - 1].scale;
  const failing = ordered[firstFail].scale;
  return { outcome: 'found', critical: passing, bracket: { failing, passing }, monotone };
}
