// The trunk governor keeps its speed-bound constraints in the table between ticks and rewrites
// them (and the stance entries' kind and zero reference row) only where the stance count moved
// them (governor.ts linearise). The claim: the table it leaves is, bit for bit, the one a
// governor that builds its table from nothing gives for the same inputs. Checked at every tick of
// a closed-loop run whose stance set changes (stand → trot → stand: 4, 2, 4 feet), against a
// freshly constructed controller's governor linearised once on the same arguments.

import { describe, expect, it } from 'vitest';
import { createAction, createObservation } from '../../../harness/contract/tick.js';
import type { ControllerSetup } from '../../../harness/builds/interface.js';
import { ReferenceController } from '../../../harness/builds/reference/index.js';
import type { TrunkGovernor } from '../../../harness/builds/reference/governor.js';
import { Plant } from '../../../harness/plant/plant.js';
import { material, plantConfig, testRobot } from '../../support/robots.js';

const VARIANT = { id: 'governed', governed: true, post: 'none' } as const;

/** First difference between the two tables' live entries, or null when every bit agrees. */
function tableDifference(live: TrunkGovernor, fresh: TrunkGovernor): string | null {
  const a = live.erg, b = fresh.erg;
  if (a.count !== b.count) return `count ${a.count} vs ${b.count}`;
  const fields = ['rows', 'referenceRows', 'bounds', 'kinds', 'inverseSqrtDenominator', 'jumpRows', 'repulsionNormal', 'repulsionInverseNorm'] as const;
  for (const field of fields) {
    const x = a[field], y = b[field];
    const perEntry = x.length / a.maxConstraints;
    for (let e = 0; e < a.count * perEntry; e++) {
      if (!Object.is(x[e], y[e])) return `${field}[${e}] ${x[e]} vs ${y[e]}`;
    }
  }
  return null;
}

describe('trunk governor: the constraint table kept between ticks', () => {
  it('equals a table built from nothing at every tick, across stance-count changes', () => {
    const robot = testRobot();
    // μs 0.5: the friction sides bind during the trot's speed-up (common practice for a wet floor).
    const plant = new Plant(plantConfig({ robot, material: material({ staticFriction: 0.5, kineticFriction: 0.4 }) }));
    const setup: ControllerSetup = {
      robot,
      controlRate_Hz: 1000,
      physicsStep_s: plant.step_s,
      gravity_mps2: [plant.gravity_mps2[0], plant.gravity_mps2[1], plant.gravity_mps2[2]],
      options: {},
    };
    const controller = new ReferenceController(setup, VARIANT);
    const governor = controller.governor as TrunkGovernor;
    const original = governor.linearise.bind(governor);
    let ticks = 0;
    let mismatches = 0;
    let firstMismatch: string | undefined;
    const stanceCounts = new Set<number>();
    governor.linearise = (stance, baseForces, inputForces, pyramid, band) => {
      original(stance, baseForces, inputForces, pyramid, band);
      const fresh = new ReferenceController(setup, VARIANT).governor as TrunkGovernor;
      fresh.linearise(stance, baseForces, inputForces, pyramid, band);
      let count = 0;
      for (let i = 0; i < stance.length; i++) count += stance[i];
      stanceCounts.add(count);
      ticks++;
      const difference = tableDifference(governor, fresh);
      if (difference !== null) {
        mismatches++;
        firstMismatch ??= `tick ${ticks} (${count} feet in stance): ${difference}`;
      }
    };

    const obs = createObservation(4);
    const action = createAction(4, controller.telemetryNames.length);
    const stepsPerTick = Math.round(0.001 / plant.step_s);
    for (let k = 0; k < 2000; k++) {
      plant.fillObservation(obs);
      obs.frictionEstimate.fill(0.5);
      const t = k / 1000;
      obs.command.gait = t >= 0.2 && t < 1.4 ? 'trot' : 'stand';
      obs.command.velocity_mps[0] = t >= 0.4 && t < 1.2 ? 0.5 : 0;
      controller.tick(obs, action);
      plant.applyAction(action);
      for (let s = 0; s < stepsPerTick; s++) plant.step();
    }
    expect(ticks).toBe(2000);
    // The run must really move the speed bounds: four-foot stance and a trot's two-foot stance.
    expect(stanceCounts.has(4)).toBe(true);
    expect(stanceCounts.has(2)).toBe(true);
    expect(mismatches, firstMismatch).toBe(0);
  });
});
