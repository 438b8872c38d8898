// The robot's state at one instant, as an observation carries it (measured) and as the scorer's
// sample carries it (true). One shape and one copy for both, so a new state field is added once.

export interface RobotState {
  time_s: number;
  trunkPosition_m: Float64Array; // 3, world
  trunkQuaternion: Float64Array; // 4, (w, x, y, z), trunk → world
  trunkVelocity_mps: Float64Array; // 3, world
  trunkAngularVelocity_radps: Float64Array; // 3, trunk (body) frame
  footPosition_m: Float64Array; // 3N, world
  footVelocity_mps: Float64Array; // 3N, world
  /** Ground force on each foot, world frame. */
  footForce_N: Float64Array; // 3N
  /** 1 when the foot touches the ground. */
  footContact: Uint8Array; // N
}

export function createRobotState(footCount: number): RobotState {
  return {
    time_s: 0,
    trunkPosition_m: new Float64Array(3),
    trunkQuaternion: new Float64Array([1, 0, 0, 0]),
    trunkVelocity_mps: new Float64Array(3),
    trunkAngularVelocity_radps: new Float64Array(3),
    footPosition_m: new Float64Array(3 * footCount),
    footVelocity_mps: new Float64Array(3 * footCount),
    footForce_N: new Float64Array(3 * footCount),
    footContact: new Uint8Array(footCount),
  };
}

/** Copies every state field into another state of the same foot count (no allocation). */
export function copyRobotState(into: RobotState, from: RobotState): void {
  into.time_s = from.time_s;
  into.trunkPosition_m.set(from.trunkPosition_m);
  into.trunkQuaternion.set(from.trunkQuaternion);
  into.trunkVelocity_mps.set(from.trunkVelocity_mps);
  into.trunkAngularVelocity_radps.set(from.trunkAngularVelocity_radps);
  into.footPosition_m.set(from.footPosition_m);
  into.footVelocity_mps.set(from.footVelocity_mps);
  into.footForce_N.set(from.footForce_N);
  into.footContact.set(from.footContact);
}
