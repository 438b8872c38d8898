// A control tick (and a governor update alone) allocates nothing, for every reference build
// except qp (its solver library, quadprog, allocates work arrays on every call).
//
// Kept in a file of its own so it runs in a fresh process (vitest's forks pool): V8's optimised
// code depends on what ran before. Known open issue: when an over-trusting controller has run
// its first ticks in the same process before a governed one, the governed ERG update has been
// seen to box one double (16 B) per tick; not yet traced. The order below is the order in which
// the builds are checked here.

import { describe, expect, it } from 'vitest';
import { createAction, createObservation, type Controller, type Observation } from '../../../harness/builds/interface.js';
import { referenceBuilds } from '../../../harness/builds/reference/index.js';
import { STANDARD_GRAVITY_mps2 } from '../../../harness/plant/defaults.js';
import { measureSteadyAllocation } from '../../support/allocation.js';
import { testRobot } from '../../support/robots.js';

const robot = testRobot();

function standingObservation(): Observation {
  const obs = createObservation(4);
  obs.trunkPosition_m.set([0, 0, robot.standingHeight_m]);
  for (let i = 0; i < 4; i++) {
    obs.footPosition_m.set([robot.hips_m[i][0], robot.hips_m[i][1], 0], 3 * i);
    obs.footContact[i] = 1;
  }
  obs.frictionEstimate.fill(0.5);
  obs.command.gait = 'trot';
  obs.command.velocity_mps[0] = 0.4;
  obs.command.yawRate_radps = 0.2;
  return obs;
}

async function make(id: string): Promise<Controller> {
  return await referenceBuilds[id]({ robot, controlRate_Hz: 1000, physicsStep_s: 0.0005, gravity_mps2: [0, 0, -STANDARD_GRAVITY_mps2], options: {} });
}

/** What the assertions below require (a transient deoptimisation may spoil one measurement). */
const clean = (r: { collections: number; bytesPerCall: number }) => r.collections === 0 && r.bytesPerCall < 6;

describe('reference builds allocate nothing per tick', () => {
  it('governed: a governor update alone allocates nothing', async () => {
    const c = await make('governed');
    const obs = standingObservation();
    const action = createAction(4, c.telemetryNames.length);
    c.tick(obs, action);
    for (let k = 0; k < 50_000; k++) c.governorUpdate!(obs); // warm-up, as above
    const result = await measureSteadyAllocation(500_000, () => c.governorUpdate!(obs), clean);
    expect(result.collections).toBe(0);
    expect(result.bytesPerCall).toBeLessThan(6); // see the bound below
  });

  for (const id of ['nominal', 'clamped', 'governed', 'overtrusting']) {
    it(`${id}: a tick allocates nothing`, { retry: 2 }, async () => {
      const c = await make(id);
      const obs = standingObservation();
      const action = createAction(4, c.telemetryNames.length);
      let k = 0;
      // Longer warm-up than measureAllocation's own: the tick is large, and until V8 has
      // optimised it the interpreter boxes doubles (allocation that optimised code does not do).
      for (; k < 30_000; k++) c.tick(obs, action);
      const result = await measureSteadyAllocation(
        200_000,
        () => {
          obs.time_s = k++ / 1000;
          c.tick(obs, action);
        },
        clean,
      );
      // The smallest per-tick allocation V8 can make is one heap number (16 B on this 64-bit
      // build, 12 B with pointer compression), so anything allocating every tick shows ≥ 12 B per
      // tick. We allow < 6 B: one-off re-optimisation garbage (code and feedback objects after the
      // previous build's ticks) spread over 2e5 ticks has been measured at ≈ 2 B per tick.
      expect(result.collections).toBe(0);
      expect(result.bytesPerCall).toBeLessThan(6);
      // Retried: once in a full `npm test` a late re-optimisation showed collections here while the
      // file alone passed; a tick that allocates fails every try.
    });
  }

});
