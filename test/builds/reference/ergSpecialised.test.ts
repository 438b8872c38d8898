// The governor's hand-specialised update for the trunk's shape (erg.ts update3x6, m = 3, n = 6)
// claims the same operations in the same order as the generic update, hence the same bits. This
// checks the claim on the observations a governed build really sees: at every governor update of
// a closed-loop run, the specialised and the generic update start from one state (applied
// reference, constraint table, error state z, target) and must end in bit-identical applied
// references and (V, Γ, Δ, √Γ). Three runs: standing, trotting on dry ground, and an abrupt
// velocity step on a slippery floor, where the friction constraints bind and hold the reference
// back (the saturated case; μs = 0.2 is "a slippery floor", common practice).

import { describe, expect, it } from 'vitest';
import { createAction, createObservation } from '../../../harness/contract/tick.js';
import type { ExplicitReferenceGovernor } from '../../../harness/builds/reference/erg.js';
import { ReferenceController } from '../../../harness/builds/reference/index.js';
import { Plant } from '../../../harness/plant/plant.js';
import { material, plantConfig, testRobot } from '../../support/robots.js';

/** The two update paths, private in erg.ts; reached here only to compare them. */
interface UpdatePaths {
  update3x6(z: ArrayLike<number>, target: ArrayLike<number>): void;
  updateGeneric(z: ArrayLike<number>, target: ArrayLike<number>): void;
}

interface Comparison {
  updates: number;
  /** Updates whose applied reference or (V, Γ, Δ, √Γ) differ in any bit. */
  mismatches: number;
  /**
   * Updates where the constraints hold the reference back: the error's level V fills more than
   * half of the admissible level Γ (so Δ = κ·(Γ − V) is what limits the step) while the applied
   * reference is still more than 0.1 (m/s or rad/s) from the target.
   */
  saturated: number;
  firstMismatch?: string;
}

function sameBits(a: Float64Array, b: Float64Array): boolean {
  for (let i = 0; i < a.length; i++) if (!Object.is(a[i], b[i])) return false;
  return true;
}

function compareOnRun(options: { mu: number; gait: 'stand' | 'trot'; speed_mps: number; duration_s: number }): Comparison {
  const robot = testRobot();
  const plant = new Plant(plantConfig({ robot, material: material({ staticFriction: options.mu, kineticFriction: 0.8 * options.mu }) }));
  const controller = new ReferenceController(
    { robot, controlRate_Hz: 1000, physicsStep_s: plant.step_s, gravity_mps2: [plant.gravity_mps2[0], plant.gravity_mps2[1], plant.gravity_mps2[2]], options: {} },
    { id: 'governed', governed: true, post: 'none' },
  );
  const erg = controller.governor?.erg as ExplicitReferenceGovernor;
  const paths = erg as unknown as UpdatePaths;
  const result: Comparison = { updates: 0, mismatches: 0, saturated: 0 };
  const start = new Float64Array(erg.m);
  const special = { applied: new Float64Array(erg.m), last: new Float64Array(4) };
  const generic = { applied: new Float64Array(erg.m), last: new Float64Array(4) };
  // Every update of the run goes through both paths from the same state; the run continues with
  // the specialised result, as the build does.
  erg.update = (z, target) => {
    start.set(erg.applied);
    paths.updateGeneric(z, target);
    generic.applied.set(erg.applied);
    generic.last.set(erg.last);
    erg.applied.set(start);
    paths.update3x6(z, target);
    special.applied.set(erg.applied);
    special.last.set(erg.last);
    result.updates++;
    if (!sameBits(special.applied, generic.applied) || !sameBits(special.last, generic.last)) {
      result.mismatches++;
      result.firstMismatch ??= `update ${result.updates}: applied ${[...special.applied]} vs ${[...generic.applied]}, (V, Γ, Δ, √Γ) ${[...special.last]} vs ${[...generic.last]}`;
    }
    let away = 0;
    for (let j = 0; j < erg.m; j++) away = Math.max(away, Math.abs(target[j] - start[j]));
    if (special.last[0] > 0.5 * special.last[1] && away > 0.1) result.saturated++;
  };

  const obs = createObservation(4);
  const action = createAction(4, controller.telemetryNames.length);
  const stepsPerTick = Math.round(0.001 / plant.step_s);
  for (let k = 0; k < options.duration_s * 1000; k++) {
    plant.fillObservation(obs);
    obs.frictionEstimate.fill(options.mu);
    const t = k / 1000;
    obs.command.gait = options.gait === 'trot' && t >= 0.3 ? 'trot' : 'stand';
    obs.command.velocity_mps[0] = t >= 0.5 ? options.speed_mps : 0;
    controller.tick(obs, action);
    plant.applyAction(action);
    for (let s = 0; s < stepsPerTick; s++) plant.step();
  }
  return result;
}

describe('explicit reference governor: the specialised 3×6 update equals the generic one bit for bit', () => {
  it('while standing still', () => {
    const r = compareOnRun({ mu: 0.8, gait: 'stand', speed_mps: 0, duration_s: 1 });
    expect(r.updates).toBeGreaterThan(500);
    expect(r.saturated).toBe(0);
    expect(r.mismatches, r.firstMismatch).toBe(0);
  });

  it('while trotting at 0.3 m/s on dry ground', () => {
    const r = compareOnRun({ mu: 0.8, gait: 'trot', speed_mps: 0.3, duration_s: 1.5 });
    expect(r.updates).toBeGreaterThan(500);
    expect(r.mismatches, r.firstMismatch).toBe(0);
  });

  it('saturated: an abrupt 1 m/s command on a slippery floor, where the threshold holds the reference', () => {
    const r = compareOnRun({ mu: 0.2, gait: 'trot', speed_mps: 1, duration_s: 1.5 });
    // The case is only a test of saturation if the governor really was held back in it.
    expect(r.saturated).toBeGreaterThan(100);
    expect(r.mismatches, r.firstMismatch).toBe(0);
  });
});
