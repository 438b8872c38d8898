// Loop time judged by a measurement made for it: the baseline's and the candidate's ticks timed on
// the same recorded observation streams, interleaved round by round, and compared by the median of
// the per-round time ratios with a distribution-free confidence interval (score/medianInterval.ts).
//
// Why interleaved rounds: machine load, CPU frequency and a neighbour's cache traffic change from
// second to second; two builds timed minutes apart (a stored baseline against a fresh candidate)
// differ by that drift, not by their code. Within one round both sides run back to back, so the
// ratio cancels whatever the machine was doing then. The order alternates (A B, B A, A B, …) so
// neither side is always the one that runs second (warm caches, a turbo budget spent).
// Why the median of ratios: one descheduled round reads many times slow; the median ignores it, and
// its order-statistic interval needs no distributional assumption.

import type { Action, Observation } from '../contract/tick.js';
import type { OpenedBuild } from '../builds/loader.js';
import type { PairedTiming } from '../results/loopTime.js';
import { medianInterval } from '../score/medianInterval.js';

export type { PairedTiming } from '../results/loopTime.js';
export { judgeAgainstLimit, type TimingJudgement } from '../score/medianInterval.js';

export interface PairedStream {
  scenario: string;
  /** The scenario's loop budget per tick, microseconds. */
  budget_us: number;
  /** Observations recorded from one run of the scenario; both sides tick through them in order. */
  observations: readonly Observation[];
  baseline: OpenedBuild;
  candidate: OpenedBuild;
  baselineAction: Action;
  candidateAction: Action;
}

export interface PairedTimingOptions {
  /** Rounds that count (each: one batch of ticks per side). */
  rounds: number;
  /** Rounds run first and discarded (JIT warm-up, first-touch page faults). */
  warmupRounds: number;
  /** Wall time one side's batch should take; the tick count per batch is calibrated to it. */
  roundTime_ms: number;
  /** Two-sided confidence of the intervals. */
  confidence: number;
}

/**
 * 31 rounds: at 95 % the order-statistic interval of the median is then the 10th to 22nd ratio
 * (coverage 0.971), narrow enough to resolve a 25 % slowdown on this class of machine. 2 ms a batch
 * is many ticks of a microsecond controller and a few of a slow process build, and keeps the whole
 * measurement around a quarter of a second per build pair (common practice for A/B micro-timing:
 * batches well above the timer's resolution, many short alternating rounds).
 */
export const DEFAULT_PAIRED_TIMING: Readonly<PairedTimingOptions> = Object.freeze({
  rounds: 31,
  warmupRounds: 4,
  roundTime_ms: 2,
  confidence: 0.95,
});

/** Fewest and most ticks in one batch (a batch must span several ticks, and finish). */
const MIN_TICKS_PER_BATCH = 3;
const MAX_TICKS_PER_BATCH = 2000;


class Cursor {
  index = 0;
  constructor(readonly observations: readonly Observation[]) {}
  next(): Observation {
    const obs = this.observations[this.index];
    this.index = this.index + 1 === this.observations.length ? 0 : this.index + 1;
    return obs;
  }
}

async function timeBatch(build: OpenedBuild, cursor: Cursor, action: Action, ticks: number): Promise<number> {
  const start_ms = performance.now();
  for (let k = 0; k < ticks; k++) {
    const pending = build.tick(cursor.next(), action);
    if (pending) await pending;
  }
  return ((performance.now() - start_ms) * 1000) / ticks;
}

/**
 * Times both sides of every stream in alternating rounds (the streams take turns) and returns the
 * ratio statistics. Ticks per batch are calibrated per stream on the slower side during warm-up.
 */
export async function timePaired(streams: readonly PairedStream[], options: PairedTimingOptions = DEFAULT_PAIRED_TIMING): Promise<PairedTiming> {
  if (streams.length === 0) throw new RangeError('timePaired: no stream to time');
  for (const stream of streams) {
    if (stream.observations.length === 0) throw new RangeError(`timePaired: stream of ${stream.scenario} has no observation`);
  }
  const state = streams.map((stream) => ({
    stream,
    baselineCursor: new Cursor(stream.observations),
    candidateCursor: new Cursor(stream.observations),
    ticks: MIN_TICKS_PER_BATCH,
  }));
  // Calibration: time a few ticks of each side, size the batch so the slower side takes about
  // roundTime_ms. The faster side then runs the same count (both see the same observations).
  for (const s of state) {
    const a = await timeBatch(s.stream.baseline, s.baselineCursor, s.stream.baselineAction, MIN_TICKS_PER_BATCH);
    const b = await timeBatch(s.stream.candidate, s.candidateCursor, s.stream.candidateAction, MIN_TICKS_PER_BATCH);
    const slower_us = Math.max(a, b, 1e-3);
    s.ticks = Math.min(MAX_TICKS_PER_BATCH, Math.max(MIN_TICKS_PER_BATCH, Math.round((options.roundTime_ms * 1000) / slower_us)));
  }
  const ratios = new Float64Array(options.rounds);
  const budgetRatios = new Float64Array(options.rounds);
  const baselineTimes = new Float64Array(options.rounds);
  const candidateTimes = new Float64Array(options.rounds);
  const total = options.warmupRounds + options.rounds;
  for (let round = 0; round < total; round++) {
    const s = state[round % state.length];
    // Both cursors restart at the same place each round, so the two batches see identical inputs.
    const start = s.baselineCursor.index;
    s.candidateCursor.index = start;
    let a: number;
    let b: number;
    if (round % 2 === 0) {
      a = await timeBatch(s.stream.baseline, s.baselineCursor, s.stream.baselineAction, s.ticks);
      b = await timeBatch(s.stream.candidate, s.candidateCursor, s.stream.candidateAction, s.ticks);
    } else {
      b = await timeBatch(s.stream.candidate, s.candidateCursor, s.stream.candidateAction, s.ticks);
      a = await timeBatch(s.stream.baseline, s.baselineCursor, s.stream.baselineAction, s.ticks);
    }
    const counted = round - options.warmupRounds;
    if (counted < 0) continue;
    // A timer that read 0 for a whole batch cannot happen at ≥ 3 ticks of real work; guard anyway.
    ratios[counted] = b / Math.max(a, 1e-6);
    budgetRatios[counted] = b / s.stream.budget_us;
    baselineTimes[counted] = a;
    candidateTimes[counted] = b;
  }
  return {
    method: 'interleaved-median-ratio',
    rounds: options.rounds,
    confidence: options.confidence,
    scenarios: streams.map((s) => s.scenario),
    baselineTick_us: medianInterval(baselineTimes, options.confidence).median,
    candidateTick_us: medianInterval(candidateTimes, options.confidence).median,
    ratio: medianInterval(ratios, options.confidence),
    budgetRatio: medianInterval(budgetRatios, options.confidence),
  };
}
