// Packed observations (contract/packed.ts) must give back every field bit for bit: the gate's
// loop-time timing replays them to both builds, and a changed value would change what a build
// computes. Checked with awkward values (−0, NaN, infinities, subnormals, the largest double) in
// every field, for one to six feet, and with the capacity limit.

import { describe, expect, it } from 'vitest';
import { createPackedObservations, observationStride, packObservation, unpackObservations } from '../../harness/contract/packed.js';
import { createObservation, type Observation } from '../../harness/contract/tick.js';

const AWKWARD = [-0, 0, Number.NaN, Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY, 5e-324, Number.MAX_VALUE, -1.5, Math.PI, 1e-300];

function filled(footCount: number, seed: number): Observation {
  const obs = createObservation(footCount);
  let k = seed;
  const next = () => AWKWARD[k++ % AWKWARD.length];
  obs.time_s = next();
  for (const array of [obs.trunkPosition_m, obs.trunkQuaternion, obs.trunkVelocity_mps, obs.trunkAngularVelocity_radps, obs.footPosition_m, obs.footVelocity_mps, obs.footForce_N, obs.frictionEstimate, obs.command.velocity_mps]) {
    for (let j = 0; j < array.length; j++) array[j] = next();
  }
  for (let i = 0; i < footCount; i++) obs.footContact[i] = (seed + i) % 2;
  obs.command.gait = seed % 2 === 0 ? 'stand' : 'trot';
  obs.command.yawRate_radps = next();
  return obs;
}

function bits(obs: Observation): string {
  const numbers: number[] = [obs.time_s, obs.command.yawRate_radps];
  for (const array of [obs.trunkPosition_m, obs.trunkQuaternion, obs.trunkVelocity_mps, obs.trunkAngularVelocity_radps, obs.footPosition_m, obs.footVelocity_mps, obs.footForce_N, obs.footContact, obs.frictionEstimate, obs.command.velocity_mps]) {
    numbers.push(...array);
  }
  const view = new DataView(new ArrayBuffer(8));
  return numbers.map((x) => {
    view.setFloat64(0, x);
    return view.getBigUint64(0).toString(16);
  }).join(' ') + ` ${obs.command.gait}`;
}

describe('packed observations', () => {
  it.each([1, 2, 4, 6])('give back every field of %i-foot observations bit for bit', (footCount) => {
    const originals = Array.from({ length: 7 }, (_, seed) => filled(footCount, seed));
    const packed = createPackedObservations(footCount, originals.length);
    for (const obs of originals) expect(packObservation(packed, obs)).toBe(true);
    expect(packed.values.length).toBe(originals.length * observationStride(footCount));
    const back = unpackObservations(packed);
    expect(back.map(bits)).toEqual(originals.map(bits));
  });

  it('stops at its capacity and keeps what it holds', () => {
    const packed = createPackedObservations(4, 2);
    expect(packObservation(packed, filled(4, 1))).toBe(true);
    expect(packObservation(packed, filled(4, 2))).toBe(true);
    expect(packObservation(packed, filled(4, 3))).toBe(false);
    expect(packed.count).toBe(2);
    expect(unpackObservations(packed).map(bits)).toEqual([filled(4, 1), filled(4, 2)].map(bits));
  });

  it('refuses a gait it has no index for, naming it', () => {
    const obs = filled(4, 0);
    (obs.command as { gait: string }).gait = 'gallop';
    expect(() => packObservation(createPackedObservations(4, 1), obs)).toThrow(/gallop/);
  });
});
