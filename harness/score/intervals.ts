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

  /** Whether the tick being recorded has been active so far (the tick's worst case). */
  get tickActive(): boolean {
    return this.activeThisTick;
  }
}
