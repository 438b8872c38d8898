// The C++ example (examples/cpp/) compiled with the plain g++ line of its header comment speaks
// the protocol over f64 frames and computes the same actions as the in-process TypeScript example
// on the same observations, to the 1e-12 (same IEEE-754 operations in the same order).

import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createAction, type Action } from '../../../harness/builds/interface.js';
import { BuildFailure, openBuild } from '../../../harness/builds/loader.js';
import { parseBuildSpec } from '../../../harness/builds/spec.js';
import { REPO_ROOT, TEST_ROBOT, isAlive, syntheticObservation, newObservation, testSetup } from '../bridge/helpers.js';

const FEET = TEST_ROBOT.hips_m.length;
const MODULE_SPEC = 'stand-ts=examples/typescript/stand_controller.ts';
let dir: string;
let program: string;

beforeAll(() => {
  dir = mkdtempSync(path.join(tmpdir(), 'footing-cpp-'));
  program = path.join(dir, 'stand_controller');
  execFileSync('g++', ['-std=c++17', '-O2', '-ffp-contract=off', '-Wall', '-Wextra', '-Werror', '-o', program, path.join(REPO_ROOT, 'examples/cpp/stand_controller.cpp')], { stdio: 'pipe' });
}, 120_000);
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function maxDifference(a: Action, b: Action): number {
  let worst = 0;
  for (const field of ['groundForce_N', 'footTarget_m', 'footTargetVelocity_mps', 'stiffness_N_per_m', 'damping_Ns_per_m', 'telemetry'] as const) {
    // Relative to the magnitude, floored at 1 so values near zero compare absolutely.
    for (let i = 0; i < a[field].length; i++) worst = Math.max(worst, Math.abs(a[field][i] - b[field][i]) / Math.max(1, Math.abs(a[field][i])));
  }
  return worst;
}

describe('the C++ stand controller example', () => {
  it('handshakes in f64, names its telemetry and reports compute time', async () => {
    const build = await openBuild(parseBuildSpec(`stand-cpp=exec:${program}`, REPO_ROOT), testSetup());
    expect(build.kind).toBe('process');
    expect(build.encoding).toBe('f64');
    expect(build.telemetryNames).toEqual(['stand.heightError_m', 'stand.tiltError']);
    expect(build.about).toBe('examples/cpp/stand_controller.cpp');
    const obs = newObservation();
    syntheticObservation(obs, 0);
    const action = createAction(FEET, 2);
    await build.tick(obs, action);
    expect(build.reportedCompute_us).toBeGreaterThanOrEqual(0);
    const pid = build.pid as number;
    await build.close();
    expect(isAlive(pid)).toBe(false);
  });

  it('agrees with the in-process TypeScript example to 1e-12 on 200 synthetic observations, options included', async () => {
    const options = { heightFrequency_Hz: 2.5, legStiffness_N_per_m: 350 };
    const cpp = await openBuild(parseBuildSpec(`stand-cpp=exec:${program} ?heightFrequency_Hz=2.5&legStiffness_N_per_m=350`, REPO_ROOT), testSetup());
    const module = await openBuild(parseBuildSpec(MODULE_SPEC, REPO_ROOT), testSetup(options));
    const obs = newObservation();
    const fromCpp = createAction(FEET, 2);
    const fromModule = createAction(FEET, 2);
    let worst = 0;
    for (let k = 0; k < 200; k++) {
      syntheticObservation(obs, k);
      await cpp.tick(obs, fromCpp);
      await module.tick(obs, fromModule);
      worst = Math.max(worst, maxDifference(fromCpp, fromModule));
      expect(Array.from(fromCpp.mode)).toEqual(Array.from(fromModule.mode));
    }
    expect(fromCpp.stiffness_N_per_m[0]).toBe(350);
    expect(worst).toBeLessThanOrEqual(1e-12);
    await cpp.close();
    await module.close();
  });

  it('fails its run clearly on a bad option (exit 2, the reason on stderr)', async () => {
    const failure = await openBuild(parseBuildSpec(`stand-cpp=exec:${program} ?dampingRatio=soft`, REPO_ROOT), testSetup()).then(
      () => null,
      (error: BuildFailure) => error,
    );
    expect(failure).toBeInstanceOf(BuildFailure);
    expect(failure?.reason).toBe('crash');
    expect(failure?.stderrTail).toMatch(/option dampingRatio: expected a finite number/);
  });
});
