// The Python example speaks the protocol end to end, and it computes the same actions as the
// TypeScript example (the same logic, in-process) on the same observations: the wire adds no error.

import { describe, expect, it } from 'vitest';
import { createAction, type Action } from '../../../harness/builds/interface.js';
import { openBuild } from '../../../harness/builds/loader.js';
import { parseBuildSpec } from '../../../harness/builds/spec.js';
import { REPO_ROOT, TEST_ROBOT, isAlive, newObservation, syntheticObservation, testSetup } from './helpers.js';

const PYTHON_SPEC = 'stand-py=exec:python3 examples/python/stand_controller.py';
const MODULE_SPEC = 'stand-ts=examples/typescript/stand_controller.ts';
const FEET = TEST_ROBOT.hips_m.length;
const TOTAL_MASS_kg = TEST_ROBOT.trunk.mass_kg + FEET * TEST_ROBOT.foot.mass_kg;

function maxDifference(a: Action, b: Action): number {
  let worst = 0;
  const fields = ['groundForce_N', 'footTarget_m', 'footTargetVelocity_mps', 'stiffness_N_per_m', 'damping_Ns_per_m', 'telemetry'] as const;
  for (const field of fields) {
    const x = a[field];
    const y = b[field];
    for (let i = 0; i < x.length; i++) {
      // Relative to the magnitude, floored at 1 so values near zero compare absolutely.
      worst = Math.max(worst, Math.abs(x[i] - y[i]) / Math.max(1, Math.abs(x[i])));
    }
  }
  return worst;
}

describe('the Python stand controller example', () => {
  it('handshakes, reports its telemetry names and compute time, and answers every tick', async () => {
    const build = await openBuild(parseBuildSpec(PYTHON_SPEC, REPO_ROOT), testSetup());
    expect(build.kind).toBe('process');
    expect(build.telemetryNames).toEqual(['stand.heightError_m', 'stand.tiltError']);
    expect(build.about).toContain('stand_controller.py');
    const obs = newObservation();
    obs.trunkPosition_m.set([0, 0, TEST_ROBOT.standingHeight_m]);
    for (let i = 0; i < FEET; i++) {
      const hip = TEST_ROBOT.hips_m[i];
      obs.footPosition_m.set([hip[0], hip[1], 0], 3 * i);
    }
    const action = createAction(FEET, build.telemetryNames.length);
    for (let k = 0; k < 50; k++) {
      obs.time_s = k * 0.001;
      await build.tick(obs, action);
      expect(build.loopTime_us).toBeGreaterThan(0);
      expect(build.reportedCompute_us).toBeGreaterThanOrEqual(0);
    }
    // Standing still at the standing height, level: every foot carries a quarter of the weight
    // (m·g / N along −gravity) and nothing sideways — the static balance of a symmetric stance.
    for (let i = 0; i < FEET; i++) {
      expect(action.mode[i]).toBe(1);
      expect(action.groundForce_N[3 * i]).toBeCloseTo(0, 12);
      expect(action.groundForce_N[3 * i + 1]).toBeCloseTo(0, 12);
      expect(action.groundForce_N[3 * i + 2]).toBeCloseTo((TOTAL_MASS_kg * 9.80665) / FEET, 9);
      // Foot below the hip at standing height: hip z = −0.03 m, so 0.27 m below the hip.
      expect(action.footTarget_m[3 * i + 2]).toBeCloseTo(-0.27, 12);
    }
    expect(action.telemetry[0]).toBe(0);
    const pid = build.pid as number;
    await build.close();
    expect(isAlive(pid)).toBe(false);
  });

  for (const encoding of ['json', 'f64'] as const) {
    it(`agrees with the in-process TypeScript example to 1e-12 on 200 synthetic observations (${encoding} encoding)`, async () => {
      const options = { heightFrequency_Hz: 2.5, legStiffness_N_per_m: 350 };
      const python = await openBuild(
        parseBuildSpec(`${PYTHON_SPEC} ?heightFrequency_Hz=2.5&legStiffness_N_per_m=350&encoding=${encoding}`, REPO_ROOT),
        testSetup(),
      );
      expect(python.encoding).toBe(encoding);
      const module = await openBuild(parseBuildSpec(MODULE_SPEC, REPO_ROOT), testSetup(options));
      expect(module.kind).toBe('module');
      expect(module.telemetryNames).toEqual(python.telemetryNames);
      const obs = newObservation();
      const fromPython = createAction(FEET, 2);
      const fromModule = createAction(FEET, 2);
      let worst = 0;
      for (let k = 0; k < 200; k++) {
        syntheticObservation(obs, k);
        await python.tick(obs, fromPython);
        await module.tick(obs, fromModule);
        worst = Math.max(worst, maxDifference(fromPython, fromModule));
        expect(Array.from(fromPython.mode)).toEqual(Array.from(fromModule.mode));
      }
      expect(fromModule.stiffness_N_per_m[0]).toBe(350);
      // Same IEEE-754 operations in the same order on both sides, numbers written in shortest
      // round-trip form: any difference would be the protocol's. 1e-12 is the bound.
      expect(worst).toBeLessThanOrEqual(1e-12);
      await python.close();
      await module.close();
    });
  }
});
