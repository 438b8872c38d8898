// In-process builds behind the same interface: modules (JS and TS), reference builds from a
// registry, and every misbehaviour turned into a BuildFailure with a reason.

import { existsSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { createAction, type Controller, type ControllerFactory } from '../../../harness/builds/interface.js';
import { BuildFailure, checkActionFinite, guardController, openBuild } from '../../../harness/builds/loader.js';
import { BuildSpecError, REFERENCE_BUILD_IDS, parseBuildSpec } from '../../../harness/builds/spec.js';
import { FIXTURES, REPO_ROOT, newObservation, testSetup } from './helpers.js';

const MODULE = `${FIXTURES}misbehaving_module.mjs`;

async function failureOf(promise: Promise<unknown>): Promise<BuildFailure> {
  const outcome = await promise.then(
    () => null,
    (error: unknown) => error,
  );
  expect(outcome).toBeInstanceOf(BuildFailure);
  return outcome as BuildFailure;
}

async function tickTimes(failure: string, ticks: number): Promise<void> {
  const build = await openBuild(parseBuildSpec(`m=${MODULE}?failure=${failure}`, REPO_ROOT), testSetup());
  const obs = newObservation();
  const action = createAction(4, build.telemetryNames.length);
  try {
    for (let k = 0; k < ticks; k++) await build.tick(obs, action);
  } finally {
    await build.close();
  }
}

describe('in-process module builds', () => {
  it('loads a TypeScript module, passes the spec options into the setup, and ticks synchronously', async () => {
    const build = await openBuild(parseBuildSpec('ts=examples/typescript/stand_controller.ts?legStiffness_N_per_m=123', REPO_ROOT), testSetup());
    expect(build.kind).toBe('module');
    expect(build.name).toBe('ts');
    const obs = newObservation();
    const action = createAction(4, build.telemetryNames.length);
    obs.trunkPosition_m[2] = 0.3;
    obs.footPosition_m.set([0.2, 0.1, 0, 0.2, -0.1, 0, -0.2, 0.1, 0, -0.2, -0.1, 0]);
    // A synchronous controller stays synchronous through the guard: no promise per tick.
    expect(build.tick(obs, action)).toBeUndefined();
    expect(action.stiffness_N_per_m[2]).toBe(123);
    expect(build.loopTime_us).toBeGreaterThanOrEqual(0);
    expect(build.reportedCompute_us).toBeNaN();
    await build.close();
  });

  it('runs healthy ticks of the misbehaving module until it misbehaves', async () => {
    await expect(tickTimes('none', 5)).resolves.toBeUndefined();
  });

  it('turns a throw in tick into BuildFailure threw, naming the tick and the error', async () => {
    const failure = await failureOf(tickTimes('tick', 5));
    expect(failure.reason).toBe('threw');
    expect(failure.message).toMatch(/build 'm' at tick 2: deliberate tick failure/);
    expect(failure.cause).toBeInstanceOf(RangeError);
    expect(failure.stderrTail).toBe('');
  });

  it('turns a rejected tick promise into BuildFailure threw', async () => {
    const failure = await failureOf(tickTimes('async', 5));
    expect(failure.reason).toBe('threw');
    expect(failure.message).toMatch(/deliberate async failure/);
  });

  it('turns NaN in the action into BuildFailure non-finite naming the field and index', async () => {
    const failure = await failureOf(tickTimes('nan', 5));
    expect(failure.reason).toBe('non-finite');
    expect(failure.message).toMatch(/at tick 2: groundForce_N\[4\] = NaN/);
  });

  it('checks telemetry for non-finite values as well', async () => {
    const failure = await failureOf(tickTimes('telemetry', 5));
    expect(failure.message).toMatch(/telemetry\[0\] = Infinity/);
  });

  it('turns a throwing factory into BuildFailure threw, and a controller without tick into malformed', async () => {
    const thrown = await failureOf(openBuild(parseBuildSpec(`m=${MODULE}?failure=factory`, REPO_ROOT), testSetup()));
    expect(thrown.reason).toBe('threw');
    expect(thrown.message).toMatch(/its factory threw: deliberate factory failure/);
    const noTick = await failureOf(openBuild(parseBuildSpec(`m=${MODULE}?failure=no-tick`, REPO_ROOT), testSetup()));
    expect(noTick.reason).toBe('malformed');
  });

  it('refuses a module that does not exist with a BuildSpecError naming the file', async () => {
    const error = await openBuild(parseBuildSpec('gone=no/such/module.js', REPO_ROOT), testSetup()).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(BuildSpecError);
    expect((error as Error).message).toMatch(/module file .*no\/such\/module.js does not exist/);
  });

  it('refuses a module without a createController or default export', async () => {
    const failure = await failureOf(openBuild(parseBuildSpec(`h=${FIXTURES}../helpers.ts`, REPO_ROOT), testSetup()));
    expect(failure.reason).toBe('malformed');
    expect(failure.message).toMatch(/must export a function createController\(setup\).*it exports .*TEST_ROBOT/);
  });
});

describe('reference builds', () => {
  const constant: ControllerFactory = (setup) => ({
    telemetryNames: ['ref.gain'],
    tick(_obs, action) {
      action.telemetry[0] = Number(setup.options.gain ?? 1);
    },
  });

  it('come from the registry by id, with the spec options in the setup', async () => {
    const build = await openBuild(parseBuildSpec('base=ref:qp?gain=4', REPO_ROOT), testSetup(), { referenceBuilds: { qp: constant } });
    expect(build).toMatchObject({ name: 'base', kind: 'reference', telemetryNames: ['ref.gain'] });
    const action = createAction(4, 1);
    build.tick(newObservation(), action);
    expect(action.telemetry[0]).toBe(4);
  });

  it('load from the bundled registry harness/builds/reference/index.ts, or say clearly that it is missing', async () => {
    const bundled = existsSync(`${REPO_ROOT}harness/builds/reference/index.ts`);
    const outcome = await openBuild(parseBuildSpec('ref:nominal', REPO_ROOT), testSetup()).catch((e: unknown) => e);
    if (bundled) {
      expect(outcome).toMatchObject({ name: 'nominal', kind: 'reference' });
      // The spec parser knows the ids without loading the controllers; the two lists must agree.
      const { referenceBuilds } = await import(/* @vite-ignore */ `${REPO_ROOT}harness/builds/reference/index.ts`);
      expect(Object.keys(referenceBuilds).sort()).toEqual([...REFERENCE_BUILD_IDS].sort());
      await (outcome as { close(): Promise<void> }).close();
    } else {
      expect(outcome).toBeInstanceOf(BuildSpecError);
      expect((outcome as Error).message).toMatch(/reference builds .* could not be loaded from harness\/builds\/reference\/index.ts/);
    }
  });

  it('fail with a BuildSpecError when the registry lacks the id', async () => {
    const error = await openBuild(parseBuildSpec('ref:governed', REPO_ROOT), testSetup(), { referenceBuilds: { qp: constant } }).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(BuildSpecError);
    expect((error as Error).message).toMatch(/reference build 'governed' is not in the registry \(it has qp\)/);
  });
});

describe('guardController and checkActionFinite', () => {
  it('passes governorUpdate through for the bench', () => {
    let updates = 0;
    const inner: Controller = { telemetryNames: [], tick() {}, governorUpdate: () => void updates++ };
    const guarded = guardController(inner, 'g');
    guarded.governorUpdate?.(newObservation());
    expect(updates).toBe(1);
  });

  it('finds the first non-finite value of any action field, and accepts a finite action', () => {
    const action = createAction(4, 3);
    expect(checkActionFinite(action)).toBeNull();
    action.damping_Ns_per_m[3] = Number.NEGATIVE_INFINITY;
    expect(checkActionFinite(action)).toBe('damping_Ns_per_m[3] = -Infinity');
    action.footTargetVelocity_mps[7] = Number.NaN;
    expect(checkActionFinite(action)).toBe('footTargetVelocity_mps[7] = NaN');
  });
});
