// The recorded trajectory's text form: fixed decimals written digit by digit (trajectory.ts) must
// match the string formatter, round to the stated resolution, and read back to the same values.

import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { fixed, formatTrajectory, parseTrajectory, type Trajectory } from '../../harness/scenario/trajectory.js';

function tiny(values: number[]): Trajectory {
  const count = 2;
  const n = 1;
  const pick = (k: number) => values[k % values.length];
  const fill = (length: number, offset: number) => Float64Array.from({ length }, (_, k) => pick(k + offset));
  return {
    footCount: n,
    count,
    t_s: Float64Array.from([0, 0.001]),
    trunkPosition_m: fill(3 * count, 0),
    trunkQuaternion: Float64Array.from([1, 0, 0, 0, 1, 0, 0, 0]),
    trunkVelocity_mps: fill(3 * count, 1),
    footPosition_m: fill(3 * count, 2),
    footVelocity_mps: fill(3 * count, 3),
    footForce_N: fill(3 * count, 4),
    contact: Int8Array.from([1, -1]),
    commandVelocity_mps: fill(2 * count, 5),
    commandYawRate_radps: fill(count, 6),
    commandGait: Int8Array.from([0, 1]),
    externalForce_N: fill(3 * count, 7),
  };
}

describe('recorded trajectory text', () => {
  it('fixed() rounds like toFixed except for the sign of a zero', () => {
    fc.assert(
      fc.property(fc.double({ min: -1e6, max: 1e6, noNaN: true }), fc.integer({ min: 0, max: 7 }), (x, d) => {
        const expected = x.toFixed(d).replace(/^-(0\.?0*)$/, '$1');
        const got = fixed(x, d);
        // Exact halves of the last digit may round either way in binary (toFixed uses the exact value).
        expect(Math.abs(Number(got) - Number(expected))).toBeLessThanOrEqual(10 ** -d * 1.000001);
      }),
    );
    expect(fixed(-1e-9, 3)).toBe('0.000');
    expect(fixed(2.5, 0)).toBe('3');
    expect(fixed(-12.34567, 3)).toBe('-12.346');
  });

  it('writes the byte form and the string form alike, and reads back within the resolution', () => {
    fc.assert(
      fc.property(fc.array(fc.double({ min: -1000, max: 1000, noNaN: true }), { minLength: 8, maxLength: 8 }), (values) => {
        const tr = tiny(values);
        const text = formatTrajectory(tr, ['A']);
        const back = parseTrajectory(text, 'x.csv');
        for (let k = 0; k < tr.trunkPosition_m.length; k++) expect(Math.abs(back.trunkPosition_m[k] - tr.trunkPosition_m[k])).toBeLessThanOrEqual(5.0001e-7);
        for (let k = 0; k < tr.footForce_N.length; k++) expect(Math.abs(back.footForce_N[k] - tr.footForce_N[k])).toBeLessThanOrEqual(5.0001e-4);
        expect(Array.from(back.contact)).toEqual([1, -1]);
        expect(Array.from(back.commandGait)).toEqual([0, 1]);
        // The digits the byte writer produced are those fixed() produces.
        expect(text.split('\n')[2].split(',')[1]).toBe(fixed(tr.trunkPosition_m[0], 6));
      }),
      { numRuns: 200 },
    );
  });
});
