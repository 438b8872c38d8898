// Counts the intervals of a boolean signal sampled once per tick: an interval starts on a rising
// edge (false → true; the signal is false before the first tick) and lasts while the signal stays
// true. A signal true on the first tick starts an interval there; one still true on the last tick
// is counted once, like any other.

export class IntervalCounter {
  count = 0;
  time_s = 0;
  private active = false;

  update(active: boolean, dt_s: number): void {
    if (active) {
      if (!this.active) this.count++;
      this.time_s += dt_s;
    }
    this.active = active;
  }
}
