// Everything of a run that must be bit-identical however it was scheduled: the result without its
// wall-clock figures (loop time, wall time, real-time factors).
import type { RunResult } from '../../harness/results/types.js';

export function deterministicPart(run: RunResult): unknown {
  const { metrics, sim, ...rest } = run;
  const { loopTime_us: _loop, ...scored } = (metrics ?? {}) as Record<string, unknown>;
  const { wall_s: _wall, realTimeFactor: _rtf, steadyRealTimeFactor: _steady, ...simRest } = (sim ?? {}) as Record<string, unknown>;
  return { ...rest, scored, simRest };
}
