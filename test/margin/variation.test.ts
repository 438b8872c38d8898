import { describe, expect, it } from 'vitest';
import { loadScenarioText } from '../../harness/scenario/index.js';
import { scenarioHash } from '../../harness/scenario/canonical.js';
import type { ResolvedScenario } from '../../harness/scenario/types.js';
import { lowestStaticFriction, peakPushForce_N, scaleFriction, scalePushes } from '../../harness/scenario/variation.js';

const TEXT = `
format: footing-scenario
formatVersion: 1
id: mixed-floor
revision: 2
title: Mixed floor (test, invented)
robot: robots/quad-24kg.yaml
duration_s: 2
ground:
  material: { staticFriction: 0.8, kineticFriction: 0.6 }
  patches:
    - { name: wet, rect: { min_m: [1, -1], max_m: [2, 1] }, material: { staticFriction: 0.3, kineticFriction: 0.2 } }
  raster:
    origin_m: [-2, -2]
    cell_m: 1
    staticFriction: [[0.5, 0.25], [0.7, 0.6]]
    kineticFriction: [[0.4, 0.2], [0.5, 0.5]]
commands:
  - { at_s: 0, gait: stand }
pushes:
  - { at_s: 0.5, duration_s: 0.1, force_N: [30, 40, 0] }
  - { at_s: 1.0, duration_s: 0.1, force_N: [0, -20, 0] }
`;

async function load(): Promise<ResolvedScenario> {
  const r = await loadScenarioText(TEXT, 'test/margin/fixtures/scenarios/mixed.yaml');
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.scenarios[0];
}

describe('scenario variations for the margin search', () => {
  it('scales every material — default, patches and raster cells — and leaves the source untouched', async () => {
    const s = await load();
    const before = structuredClone(s);
    const v = scaleFriction(s, 0.5);
    expect(s).toEqual(before);
    const f = v.plant.ground.friction;
    expect(f.default.staticFriction).toBeCloseTo(0.4, 12);
    expect(f.default.kineticFriction).toBeCloseTo(0.3, 12);
    expect(f.patches[0].material.staticFriction).toBeCloseTo(0.15, 12);
    expect(f.patches[0].material.kineticFriction).toBeCloseTo(0.1, 12);
    expect(f.raster!.staticFriction).toEqual([[0.25, 0.125], [0.35, 0.3]]);
    expect(f.raster!.kineticFriction).toEqual([[0.2, 0.1], [0.25, 0.25]]);
    expect(f.default.stribeckVelocity_mps).toBe(s.plant.ground.friction.default.stribeckVelocity_mps);
    // The lowest-friction material is the raster cell of 0.25, halved.
    expect(lowestStaticFriction(s.plant.ground.friction)).toBe(0.25);
    expect(lowestStaticFriction(f)).toBeCloseTo(0.125, 12);
  });

  it('gives a derived id and a hash recomputed from the new content', async () => {
    const s = await load();
    const v = scaleFriction(s, 0.5359);
    expect(v.id).toBe('mixed-floor-friction-x0p5359');
    expect(v.file).toBe(s.file);
    expect(v.hash).not.toBe(s.hash);
    expect(v.hash).toBe(scenarioHash(v));
    // Same factor, same content, same hash: the variation is reproducible.
    expect(scaleFriction(s, 0.5359).hash).toBe(v.hash);
  });

  it('scales every push force and reports the peak', async () => {
    const s = await load();
    expect(peakPushForce_N(s)).toBeCloseTo(50, 12); // |(30, 40, 0)| = 50 N
    const v = scalePushes(s, 1.5);
    expect(v.id).toBe('mixed-floor-push-x1p5');
    expect(peakPushForce_N(v)).toBeCloseTo(75, 12);
    const second = v.plant.pushes[1];
    expect(second.kind === 'pulse' && second.force_N).toEqual([0, -30, 0]);
    expect(second.kind === 'pulse' && second.at_s).toBe(1.0);
  });

  it('refuses a negative or non-finite factor', async () => {
    const s = await load();
    expect(() => scaleFriction(s, -0.1)).toThrow(/friction scale -0.1/);
    expect(() => scalePushes(s, Number.NaN)).toThrow(/push scale NaN/);
  });
});
