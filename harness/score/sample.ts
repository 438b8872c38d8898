// One control tick as the scorer sees it: the plant's truth after the tick's physics steps, the
// action the build returned for it, and the tick's measured wall time. The episode loop owns one
// TickSample per run and overwrites it every tick (no allocation); scorers copy what they keep.

export interface TickSample {
  time_s: number;
  /** Control period, the weight of this sample in time integrals. */
  dt_s: number;
  trunkPosition_m: Float64Array; // 3, world
  trunkQuaternion: Float64Array; // 4, (w, x, y, z)
  trunkVelocity_mps: Float64Array; // 3, world
  footPosition_m: Float64Array; // 3N, world
  footVelocity_mps: Float64Array; // 3N, world
  /** True ground force on each foot, world frame (no sensor noise). */
  footForce_N: Float64Array; // 3N
  /** True local static friction under each foot. */
  footStaticFriction: Float64Array; // N
  /** The build's action for this tick. */
  mode: Uint8Array; // N, STANCE = 1
  wantedForce_N: Float64Array; // 3N, world
  /** Normal force of the ground on the trunk's collision box (0 when clear). */
  trunkGroundForce_N: number;
  /** Commanded trunk position reference (integral of the commanded velocity), world. */
  referencePosition_m: Float64Array; // 3
  /** Wall time of the build's tick (in-process) or round trip (process build), microseconds. */
  loopTime_us: number;
  /** The build's own reported compute time for process builds, else NaN. */
  reportedCompute_us: number;
}

export function createTickSample(footCount: number): TickSample {
  return {
    time_s: 0,
    dt_s: 0,
    trunkPosition_m: new Float64Array(3),
    trunkQuaternion: new Float64Array([1, 0, 0, 0]),
    trunkVelocity_mps: new Float64Array(3),
    footPosition_m: new Float64Array(3 * footCount),
    footVelocity_mps: new Float64Array(3 * footCount),
    footForce_N: new Float64Array(3 * footCount),
    footStaticFriction: new Float64Array(footCount),
    mode: new Uint8Array(footCount),
    wantedForce_N: new Float64Array(3 * footCount),
    trunkGroundForce_N: 0,
    referencePosition_m: new Float64Array(3),
    loopTime_us: 0,
    reportedCompute_us: Number.NaN,
  };
}
