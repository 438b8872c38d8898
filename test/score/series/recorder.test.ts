import { describe, expect, it } from 'vitest';
import { createAction, STANCE, SWING } from '../../../harness/builds/interface.js';
import { createSeriesRecorder, LOOP_BIN_RATIO, LOOP_BIN_START_us } from '../../../harness/score/series/recorder.js';
import { MAX_SERIES_POINTS } from '../../../harness/score/series/types.js';
import type { ResolvedScenario } from '../../../harness/scenario/types.js';
import { createTickSample, type TickSample } from '../../../harness/score/sample.js';
import { loadedThreshold_N } from '../../../harness/score/thresholds.js';
import { plantConfig } from '../../support/robots.js';

function scenario(duration_s: number, rate_Hz: number): ResolvedScenario {
  return {
    id: 'hand-made',
    revision: 1,
    title: 'hand-made ticks',
    file: 'none.yaml',
    hash: 'h',
    duration_s,
    seed: 1,
    plant: plantConfig(),
    control: { rate_Hz, loopBudget_us: 1e6 / rate_Hz },
    commands: [{ at_s: 0, gait: 'stand', velocity_mps: [0, 0, 0], yawRate_radps: 0 }],
    sensing: { frictionEstimate: { kind: 'truth' }, forceNoise_N: 0 },
    acceptance: { mustNotFall: true, minFrictionMargin: null, maxSlipDistance_m: null, maxCommandedViolations: null, minProgress: null },
    tags: [],
  };
}

/** All four feet loaded with f = (fx, 0, fz) on μs, foot 0 sliding at `speed` along x. */
function fill(s: TickSample, tick: number, dt_s: number, o: { fx: number; fz: number; mu: number; speed: number; loop_us: number }): void {
  s.time_s = (tick + 1) * dt_s;
  s.dt_s = dt_s;
  for (let i = 0; i < 4; i++) {
    s.footForce_N[3 * i] = o.fx;
    s.footForce_N[3 * i + 1] = 0;
    s.footForce_N[3 * i + 2] = o.fz;
    s.footStaticFriction[i] = o.mu;
    s.footVelocity_mps[3 * i] = i === 0 ? o.speed : 0;
    s.footPosition_m[3 * i] = i === 0 ? o.speed * s.time_s : i;
  }
  s.loopTime_us = o.loop_us;
}

describe('series recorder', () => {
  it('records friction use |f_t|/(μs f_n), slip distance ∫|v_t|dt and slip segments of loaded feet', () => {
    const rate_Hz = 100;
    const sc = scenario(1, rate_Hz);
    const recorder = createSeriesRecorder(sc, 'b');
    const threshold = loadedThreshold_N(sc.plant.robot);
    recorder.onStart?.({ footCount: 4, telemetryNames: [], loadedThreshold_N: threshold });
    const s = createTickSample(4);
    const action = createAction(4, 0);
    action.mode.fill(STANCE);
    for (let k = 0; k < 100; k++) {
      // Coulomb: 30 N tangential on μs 0.5 × 100 N capacity uses 0.6 of the cone.
      fill(s, k, 0.01, { fx: 30, fz: 100, mu: 0.5, speed: 0.1, loop_us: 50 });
      s.mode.set(action.mode); // as the episode loop does (fillSample)
      recorder.onTick(s, action);
    }
    const series = recorder.finish();
    const use = series.feet[0].frictionUse.max.filter((v) => v !== null) as number[];
    expect(Math.max(...use)).toBeCloseTo(0.6, 9);
    expect(Math.min(...(series.feet[0].frictionUse.min as number[]))).toBeCloseTo(0.6, 9);
    // Constant 0.1 m/s for 100 ticks of 0.01 s: 0.1 m (rectangle rule, as the scorer integrates).
    const last = series.feet[0].slipDistance_m.length - 1;
    expect(series.feet[0].slipDistance_m[last]).toBeCloseTo(0.1, 4);
    expect(series.feet[1].slipDistance_m[last]).toBe(0);
    // One slip interval of foot 0 from the first to the last tick, closed at finish().
    expect(series.slips).toHaveLength(1);
    expect(series.slips[0].foot).toBe(0);
    expect(series.slips[0].distance_m).toBeCloseTo(0.1 - 0.001, 4); // distance after the first tick
    // Each foot touched down once (loaded from the first tick).
    expect(series.footholds.map((f) => f.foot)).toEqual([0, 1, 2, 3]);
    expect(series.feet[0].stance.every((v) => v === 1)).toBe(true);
    // 50 µs lands in the log bin whose range holds it.
    expect(series.loopTime.ticks).toBe(100);
    const [[bin, count]] = series.loopTime.bins;
    expect(count).toBe(100);
    expect(LOOP_BIN_START_us * LOOP_BIN_RATIO ** bin).toBeLessThanOrEqual(50);
    expect(LOOP_BIN_START_us * LOOP_BIN_RATIO ** (bin + 1)).toBeGreaterThan(50);
  });

  it('leaves friction use undefined (null) while a foot is unloaded and counts a new foothold at each touchdown', () => {
    const sc = scenario(0.6, 100);
    const recorder = createSeriesRecorder(sc, 'b');
    recorder.onStart?.({ footCount: 4, telemetryNames: [], loadedThreshold_N: 10 });
    const s = createTickSample(4);
    const action = createAction(4, 0);
    for (let k = 0; k < 60; k++) {
      const airborne = Math.floor(k / 20) === 1; // ticks 20..39 in the air
      fill(s, k, 0.01, { fx: 1, fz: airborne ? 0 : 50, mu: 0.8, speed: 0, loop_us: 10 });
      action.mode.fill(airborne ? SWING : STANCE);
      s.mode.set(action.mode); // as the episode loop does (fillSample)
      recorder.onTick(s, action);
    }
    const series = recorder.finish();
    expect(series.bucketTicks).toBe(1);
    expect(series.feet[2].frictionUse.max.slice(20, 40).every((v) => v === null)).toBe(true);
    expect(series.feet[2].frictionUse.max[19]).toBeCloseTo(1 / 40, 9);
    expect(series.footholds.filter((f) => f.foot === 2).map((f) => f.t_s)).toEqual([0.01, 0.41]);
    expect(series.feet[2].stance.slice(20, 40).every((v) => v === 0)).toBe(true);
  });

  it('bounds every series of a long run to MAX_SERIES_POINTS and keeps a one-tick force spike', () => {
    const sc = scenario(120, 1000); // 120 000 ticks
    const recorder = createSeriesRecorder(sc, 'b');
    recorder.onStart?.({ footCount: 4, telemetryNames: ['governor.target.vx', 'other', 'governor.applied.vx'], loadedThreshold_N: 10 });
    const s = createTickSample(4);
    const action = createAction(4, 3);
    action.mode.fill(STANCE);
    for (let k = 0; k < 120_000; k++) {
      fill(s, k, 0.001, { fx: 0, fz: k === 65_432 ? 900 : 60, mu: 0.8, speed: 0, loop_us: 10 });
      action.telemetry[0] = 0.5;
      action.telemetry[2] = k < 60_000 ? 0.25 : 0.5;
      s.mode.set(action.mode); // as the episode loop does (fillSample)
      recorder.onTick(s, action);
    }
    const series = recorder.finish();
    const points = series.feet[0].normalForce_N.min.length + series.feet[0].normalForce_N.max.length;
    expect(points).toBeLessThanOrEqual(MAX_SERIES_POINTS);
    expect(Math.max(...(series.feet[0].normalForce_N.max as number[]))).toBe(900);
    expect(series.t_s.length).toBeLessThanOrEqual(MAX_SERIES_POINTS / 2);
    expect(series.governor.map((g) => g.axis)).toEqual(['vx']);
    expect(series.governor[0].applied.min[0]).toBe(0.25);
    expect(series.governor[0].target.max.at(-1)).toBe(0.5);
    // A compact file: well under 200 kB for two minutes at 1 kHz.
    expect(JSON.stringify(series).length).toBeLessThan(200_000);
  });
});
