import { describe, expect, it } from 'vitest';
import { reachSpeed_mps } from '../../harness/scenario/plausibility.js';
import { BASE_YAML, edit, load } from './helpers.js';

async function warnings(text: string): Promise<string[]> {
  const r = await load(text);
  if (!r.ok) throw new Error(`expected the scenario to load: ${JSON.stringify(r.errors)}`);
  return r.warnings.map((w) => `${w.path}: ${w.message}`);
}

describe('probable unit slips are warned about, naming the field', () => {
  it('warns about an incline under one degree written with decimals (radians typed as degrees)', async () => {
    const text = `${BASE_YAML}`.replace('ground:\n', 'ground:\n  incline_deg: { pitch: 0.2 }\n');
    const [w] = await warnings(text);
    // 0.2 rad × 180/π = 11.46°.
    expect(w).toBe('/ground/incline_deg/pitch: incline 0.2° is under one degree; if it was meant in radians it is 11.5° (incline_deg takes degrees)');
  });

  it('does not warn about whole or larger inclines', async () => {
    expect(await warnings(BASE_YAML.replace('ground:\n', 'ground:\n  incline_deg: { pitch: 5, roll: 1.5 }\n'))).toEqual([]);
  });

  it('warns about a commanded speed beyond the robot\'s reach at its gait', async () => {
    // quad-24kg: L_max 0.42 m, h 0.30 m, stance 0.4 s × 0.6 → 2·√(0.42² − 0.30²)/0.24 = 2.45 m/s.
    const text = edit([['  - { at_s: 1, gait: trot, velocity_mps: [0.5, 0, 0] }\n', '  - { at_s: 1, gait: trot, velocity_mps: [5, 0, 0] }\n']]);
    const [w] = await warnings(text);
    expect(w).toMatch(/^\/commands\/1\/velocity_mps: commanded speed 5\.00 m\/s is beyond this robot's reach at its gait \(about 2\.45 m\/s/);
    expect(await warnings(BASE_YAML)).toEqual([]);
  });

  it('warns about a yaw rate that reads like degrees per second', async () => {
    const text = edit([['  - { at_s: 1, gait: trot, velocity_mps: [0.5, 0, 0] }\n', '  - { at_s: 1, gait: trot, velocity_mps: [0.5, 0, 0], yawRate_radps: 30 }\n']]);
    expect((await warnings(text))[0]).toMatch(/^\/commands\/1\/yawRate_radps: yaw rate 30 rad\/s is more than a turn per second; if it was meant in degrees per second it is 0\.524 rad\/s$/);
  });

  it('computes the reach speed from the leg chord and stance time', () => {
    const robot = { standingHeight_m: 0.3, leg: { maxLength_m: 0.5 }, gait: { period_s: 0.4, dutyFactor: 0.5 } } as Parameters<typeof reachSpeed_mps>[0];
    // chord 2·√(0.25 − 0.09) = 0.8 m over 0.2 s of stance = 4 m/s.
    expect(reachSpeed_mps(robot)).toBeCloseTo(4, 12);
  });
});
