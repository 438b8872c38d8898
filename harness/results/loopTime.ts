// The paired loop-time measurement as results.json keeps it (field `loopTime`): made by
// harness/bench/pairedTiming.ts, judged by harness/gate/loopTimeRules.ts. Plain data.

import type { MedianInterval } from '../score/medianInterval.js';

export interface PairedTiming {
  method: 'interleaved-median-ratio';
  rounds: number;
  confidence: number;
  scenarios: string[];
  /** Median per-tick time of each side over the rounds, microseconds. */
  baselineTick_us: number;
  candidateTick_us: number;
  /** Candidate ÷ baseline per-tick time, per round: median and interval. */
  ratio: MedianInterval;
  /** Candidate per-tick time ÷ the round's scenario budget: median and interval. */
  budgetRatio: MedianInterval;
}

/** One build pair's measurement, as stored in results.json `loopTime`. */
export interface PairedLoopTimeRecord extends PairedTiming {
  baselineBuild: string;
  candidateBuild: string;
}
