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
  copyFloats(into.trunkPosition_m, from.trunkPosition_m);
  copyFloats(into.trunkQuaternion, from.trunkQuaternion);
  copyFloats(into.trunkVelocity_mps, from.trunkVelocity_mps);
  copyFloats(into.trunkAngularVelocity_radps, from.trunkAngularVelocity_radps);
  copyFloats(into.footPosition_m, from.footPosition_m);
  copyFloats(into.footVelocity_mps, from.footVelocity_mps);
  copyFloats(into.footForce_N, from.footForce_N);
  copyBytes(into.footContact, from.footContact);
}

/**
 * into[k] = from[k] for every k of `into` (same length). A plain loop: for the few values of a
 * robot state it is several times cheaper than TypedArray.prototype.set, a call into the runtime
 * the JIT does not inline (measured in the episode loop, docs/bench.md).
 */
export function copyFloats(into: Float64Array, from: Float64Array): void {
  for (let k = 0; k < into.length; k++) into[k] = from[k];
}

/** copyFloats for byte arrays (foot contact flags, leg modes). */
export function copyBytes(into: Uint8Array, from: Uint8Array): void {
  for (let k = 0; k < into.length; k++) into[k] = from[k];
}
