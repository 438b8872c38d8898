// A standing trot observation for controller-level tests: trunk at standing height over the hips,
// every foot on the ground under its hip, friction estimate 0.5, trot at 0.4 m/s turning 0.2 rad/s.

import { createObservation, type Observation } from '../../harness/builds/interface.js';
import type { RobotParams } from '../../harness/plant/types.js';

export function standingObservation(robot: RobotParams, footNormalForce_N = 0): Observation {
  const obs = createObservation(robot.hips_m.length);
  obs.trunkPosition_m.set([0, 0, robot.standingHeight_m]);
  for (let i = 0; i < robot.hips_m.length; i++) {
    obs.footPosition_m.set([robot.hips_m[i][0], robot.hips_m[i][1], 0], 3 * i);
    obs.footContact[i] = 1;
    obs.footForce_N[3 * i + 2] = footNormalForce_N;
  }
  obs.frictionEstimate.fill(0.5);
  obs.command.gait = 'trot';
  obs.command.velocity_mps[0] = 0.4;
  obs.command.yawRate_radps = 0.2;
  return obs;
}
