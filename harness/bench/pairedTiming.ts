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
 * (coverage 0.971), narrow enough to resolve a 25 % slowdown on this class of machine. 1 ms a batch
 * is hundreds of ticks of a microsecond controller and a few of a slow process build, far above
 * the timer's resolution and mostly inside one scheduler time slice; with the warm-up the whole
 * measurement takes about 0.15 s per build pair (common practice for A/B micro-timing: batches
 * well above the timer's resolution, many short alternating rounds).
 */
export const DEFAULT_PAIRED_TIMING: Readonly<PairedTimingOptions> = Object.freeze({
  rounds: 31,
  warmupRounds: 4,
  roundTime_ms: 1,
  confidence: 0.95,
});

/** Fewest and most ticks in one batch (a batch must span several ticks, and finish). */
const MIN_TICKS_PER_BATCH = 3;
const MAX_TICKS_PER_BATCH = 2000;

/**
 * Warm-up before anything is calibrated or counted. Two builds loaded from different files have
 * their own JIT-compiled code, each optimised when V8 gets to it: timed from cold, one side can
 * run in the interpreter or baseline tier while the other is optimised (two copies of one module
 * read 0.25–0.7× or 2.6× each other here), and a batch size calibrated on cold ticks is far too
 * small once they are warm (80 µs batches instead of 2 ms). So both sides first tick, alternately
 * and in growing batches, until each has spent WARMUP_MIN_ms ticking and its last batch was no
 * more than WARMUP_SETTLED faster per tick than the one before (cold code speeds up by several
 * times, noise by a few per cent), at most WARMUP_MAX_ms each. The builds' code is shared by
 * their instances on every stream, so this is done once, on the first stream.
 */
const WARMUP_MIN_ms = 20;
const WARMUP_MAX_ms = 300;
const WARMUP_SETTLED = 0.85;


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

/** Ticks both sides of one stream in growing, alternating batches until each is warm (see WARMUP_MIN_ms). */
async function warmUp(s: { stream: PairedStream; baselineCursor: Cursor; candidateCursor: Cursor }): Promise<void> {
  const sides = [
    { build: s.stream.baseline, cursor: s.baselineCursor, action: s.stream.baselineAction, spent_ms: 0, last_us: Number.POSITIVE_INFINITY, settled: false },
    { build: s.stream.candidate, cursor: s.candidateCursor, action: s.stream.candidateAction, spent_ms: 0, last_us: Number.POSITIVE_INFINITY, settled: false },
  ];
  let ticks = MIN_TICKS_PER_BATCH;
  while (sides.some((side) => !side.settled)) {
    for (const side of sides) {
      if (side.settled) continue;
      const tick_us = await timeBatch(side.build, side.cursor, side.action, ticks);
      side.spent_ms += (tick_us * ticks) / 1000;
      const steady = tick_us >= WARMUP_SETTLED * side.last_us;
      side.last_us = tick_us;
      if ((side.spent_ms >= WARMUP_MIN_ms && steady) || side.spent_ms >= WARMUP_MAX_ms) side.settled = true;
    }
    ticks = Math.min(MAX_TICKS_PER_BATCH, 2 * ticks);
  }
}

/**
 * Times both sides of every stream in alternating rounds (the streams take turns) and returns the
 * ratio statistics. Both builds are warmed first (warmUp); ticks per batch are then calibrated per
 * stream on the slower side.
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
    /** Rounds this stream has run: its own order alternates (A B, B A, …) whatever the stream count. */
    rounds: 0,
  }));
  await warmUp(state[0]);
  // Calibration, on warm code: grow a batch until the slower side's takes a quarter of
  // roundTime_ms, then size it so that side takes about roundTime_ms. The faster side runs the
  // same count (both see the same observations). Each size is timed A B B A and each side's
  // faster batch kept: a batch the scheduler interrupted reads slow, and one such read had
  // sized a stream's batches at 3 ticks (about a microsecond, below the timer's noise).
  for (const s of state) {
    let ticks = MIN_TICKS_PER_BATCH;
    let slower_us = 0;
    for (;;) {
      let a = Number.POSITIVE_INFINITY;
      let b = Number.POSITIVE_INFINITY;
      for (const order of [0, 1]) {
        s.candidateCursor.index = s.baselineCursor.index;
        if (order === 0) {
          a = Math.min(a, await timeBatch(s.stream.baseline, s.baselineCursor, s.stream.baselineAction, ticks));
          b = Math.min(b, await timeBatch(s.stream.candidate, s.candidateCursor, s.stream.candidateAction, ticks));
        } else {
          b = Math.min(b, await timeBatch(s.stream.candidate, s.candidateCursor, s.stream.candidateAction, ticks));
          a = Math.min(a, await timeBatch(s.stream.baseline, s.baselineCursor, s.stream.baselineAction, ticks));
        }
      }
      slower_us = Math.max(a, b, 1e-3);
      if (ticks >= MAX_TICKS_PER_BATCH || ticks * slower_us >= (options.roundTime_ms * 1000) / 4) break;
      ticks = Math.min(MAX_TICKS_PER_BATCH, 4 * ticks);
    }
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
    // By the stream's own round count, not the global one: with an even number of streams the
    // global parity gave each stream one fixed order (two streams: always A B on the first, B A
    // on the second), so a second-runs-faster effect (warm caches) never cancelled.
    if (s.rounds++ % 2 === 0) {
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
