// Stand/trot phase scheduler: diagonal pairs move together, each leg spends the duty factor of
// the period in stance, the trot starts with all feet down, and a return to stand never leaves a
// foot in the air.

import { describe, expect, it } from 'vitest';
import { GaitScheduler } from '../../../harness/builds/reference/gait.js';
import { STANCE, SWING } from '../../../harness/builds/interface.js';

const PERIOD = 0.4;
const DUTY = 0.6;
const DT = 0.001;

describe('gait scheduler', () => {
  it('keeps every foot in stance while standing', () => {
    const s = new GaitScheduler(4, PERIOD, DUTY, DT);
    for (let k = 0; k < 500; k++) {
      s.update('stand');
      expect(Array.from(s.mode)).toEqual([STANCE, STANCE, STANCE, STANCE]);
    }
  });

  it('trots diagonal pairs half a period apart with the robot duty factor', () => {
    const s = new GaitScheduler(4, PERIOD, DUTY, DT);
    const ticks = Math.round((10 * PERIOD) / DT);
    const stanceTicks = [0, 0, 0, 0];
    let firstLift = -1;
    for (let k = 0; k < ticks; k++) {
      s.update('trot');
      expect(s.mode[0]).toBe(s.mode[3]); // FL with HR
      expect(s.mode[1]).toBe(s.mode[2]); // FR with HL
      expect(s.mode[0] === SWING && s.mode[1] === SWING).toBe(false); // duty > ½: no flight
      for (let i = 0; i < 4; i++) stanceTicks[i] += s.mode[i];
      if (firstLift < 0 && s.liftOff.some((x) => x === 1)) firstLift = k;
    }
    for (let i = 0; i < 4; i++) expect(stanceTicks[i] / ticks).toBeCloseTo(DUTY, 2);
    // FR+HL lifts first, after (duty − ½)·period of four-foot support.
    expect(firstLift * DT).toBeCloseTo((DUTY - 0.5) * PERIOD, 2);
  });

  it('reports swing progress from 0 to 1 over the swing time', () => {
    const s = new GaitScheduler(4, PERIOD, DUTY, DT);
    let previous = -1;
    let sawEnd = false;
    for (let k = 0; k < 400; k++) {
      s.update('trot');
      if (s.mode[1] === SWING) {
        expect(s.swingProgress[1]).toBeGreaterThan(previous);
        expect(s.swingRemaining_s[1]).toBeCloseTo((1 - s.swingProgress[1]) * (1 - DUTY) * PERIOD, 12);
        previous = s.swingProgress[1];
      } else if (previous >= 0) {
        sawEnd = previous > 0.99;
        break;
      }
    }
    expect(sawEnd).toBe(true);
  });

  it('returns to stand only when no foot is mid-swing', () => {
    for (const stopAfter of [0.05, 0.13, 0.21, 0.33, 0.39]) {
      const s = new GaitScheduler(4, PERIOD, DUTY, DT);
      for (let k = 0; k < Math.round((PERIOD + stopAfter) / DT); k++) s.update('trot');
      const lastProgress = [0, 0, 0, 0];
      let stopped = -1;
      for (let k = 0; k < 1000 && stopped < 0; k++) {
        const before = Array.from(s.mode);
        for (let i = 0; i < 4; i++) lastProgress[i] = s.swingProgress[i];
        s.update('stand');
        if (!s.trotting) {
          stopped = k;
          // A foot in the air one tick ago was at the very end of its swing.
          for (let i = 0; i < 4; i++) if (before[i] === SWING) expect(lastProgress[i]).toBeGreaterThan(0.98);
        }
      }
      expect(stopped).toBeGreaterThanOrEqual(0);
      expect(stopped * DT).toBeLessThanOrEqual((1 - DUTY) * PERIOD + DT);
      s.update('stand');
      expect(Array.from(s.mode)).toEqual([STANCE, STANCE, STANCE, STANCE]);
    }
  });

  it('rejects robots it cannot trot, naming the value', () => {
    expect(() => new GaitScheduler(4, PERIOD, 0.4, DT)).toThrow(/dutyFactor = 0.4/);
    expect(() => new GaitScheduler(6, PERIOD, DUTY, DT)).toThrow(/robot has 6/);
    expect(() => new GaitScheduler(4, 0, DUTY, DT)).toThrow(/period_s = 0/);
  });
});
