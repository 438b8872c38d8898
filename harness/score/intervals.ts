// Counts the intervals of a boolean signal seen every physics step and grouped by control tick: a
// tick is active when the signal held on any of its steps (the tick's worst case); an interval
// starts on a rising edge of that per-tick signal (clear before the first tick) and lasts while
// ticks stay active. Time is exact at step resolution: Σ step weight over the active steps.
// Grouping the edges by tick keeps one landing's flicker within a tick one interval, so counts
// do not grow as the physics step is refined.

export class IntervalCounter {
  count = 0;
  time_s = 0;
  private active = false;
  private activeThisTick = false;

  /** One step of the signal; `dt_s` its weight. */
  step(active: boolean, dt_s: number): void {
    if (active) {
      this.activeThisTick = true;
      this.time_s += dt_s;
    }
  }

  /** Ends the tick: counts a rising edge of the per-tick signal. */
  endTick(): void {
    if (this.activeThisTick && !this.active) this.count++;
    this.active = this.activeThisTick;
    this.activeThisTick = false;
  }

  /** One tick of a single step (step + endTick), for per-tick signals. */
  update(active: boolean, dt_s: number): void {
    this.step(active, dt_s);
    this.endTick();
  }
}

/** IntervalCounters side by side (one per foot and their union), in typed arrays for the step pass. */
export class IntervalBank {
  readonly count: Int32Array;
  readonly time_s: Float64Array;
  private readonly active: Uint8Array;
  private readonly activeThisTick: Uint8Array;

  constructor(readonly channels: number) {
    this.count = new Int32Array(channels);
    this.time_s = new Float64Array(channels);
    this.active = new Uint8Array(channels);
    this.activeThisTick = new Uint8Array(channels);
  }

  /** Channel k's signal held on this step of weight dt_s (a step it did not hold needs no call). */
  step(k: number, dt_s: number): void {
    this.activeThisTick[k] = 1;
    this.time_s[k] += dt_s;
  }

  /** Ends the tick on every channel: counts each channel's rising edge of the per-tick signal. */
  endTick(): void {
    for (let k = 0; k < this.channels; k++) {
      if (this.activeThisTick[k] === 1 && this.active[k] === 0) this.count[k]++;
      this.active[k] = this.activeThisTick[k];
      this.activeThisTick[k] = 0;
    }
  }
}
