// The patch grid is an index, not a new rule: with a thousand overlapping patches of every kind the
// lookup names the same patch as testing every patch from last to first — also on patch edges,
// corners, the grid's own border and outside it.

import { describe, expect, it } from 'vitest';
import { FrictionField } from '../../harness/plant/frictionMap.js';
import { SeededRandom } from '../../harness/plant/random.js';
import type { FrictionMap, Patch } from '../../harness/plant/types.js';
import { material } from '../support/robots.js';

function randomMap(count: number, seed: number): FrictionMap {
  const random = new SeededRandom(seed);
  const u = (a: number, b: number) => a + (b - a) * random.uniform();
  const patches: Patch[] = [];
  for (let p = 0; p < count; p++) {
    const x = u(-20, 20);
    const y = u(-5, 5);
    const size = p % 50 === 0 ? u(5, 15) : u(0.05, 1); // a few large patches over many small ones
    const kind = p % 3;
    const shape: Patch['shape'] =
      kind === 0
        ? { kind: 'rect', min_m: [x, y], max_m: [x + size, y + size / 2] }
        : kind === 1
          ? { kind: 'circle', center_m: [x, y], radius_m: size / 2 }
          : { kind: 'polygon', vertices_m: [[x, y], [x + size, y], [x + size / 2, y + size]] };
    patches.push({ name: `p${p}`, shape, material: material({ name: `m${p}`, staticFriction: 0.1 + (p % 9) / 10 }) });
  }
  return { default: material({ name: 'floor' }), patches };
}

/** Every patch from last to first. */
// A field of patch p alone answers "does p hold (x, y)" with the field's own shape rules.
function linearLookup(single: readonly FrictionField[], x: number, y: number): number {
  for (let p = single.length - 1; p >= 0; p--) {
    if (single[p].lookup(x, y) === 1) return p + 1;
  }
  return 0; // the default material
}

describe('friction patch grid', () => {
  it('finds the same patch as a linear scan for 1000 overlapping patches', () => {
    const map = randomMap(1000, 7);
    const field = new FrictionField(map);
    const single = map.patches.map((patch) => new FrictionField({ default: map.default, patches: [patch] }));
    const random = new SeededRandom(11);
    const points: [number, number][] = [];
    for (let k = 0; k < 4000; k++) points.push([-25 + 50 * random.uniform(), -8 + 16 * random.uniform()]);
    // Edges and corners of patches, where a cell boundary may fall.
    for (const patch of map.patches.slice(0, 300)) {
      const s = patch.shape;
      if (s.kind === 'rect') points.push(s.min_m, s.max_m, [s.min_m[0], s.max_m[1]]);
      else if (s.kind === 'circle') points.push([s.center_m[0] + s.radius_m, s.center_m[1]]);
      else points.push(...s.vertices_m);
    }
    let inPatches = 0;
    for (const [x, y] of points) {
      const expected = linearLookup(single, x, y);
      expect(field.lookup(x, y), `at (${x}, ${y})`).toBe(expected);
      if (expected > 0) inPatches++;
    }
    expect(inPatches).toBeGreaterThan(300); // the comparison covered patches, not only bare floor
    // The per-step form reads the point from an array at an offset (feet at stride 3, as the plant).
    const packed = new Float64Array(3 * points.length);
    points.forEach(([x, y], k) => packed.set([x, y, -0.001], 3 * k));
    for (let k = 0; k < points.length; k++) expect(field.lookupAt(packed, 3 * k)).toBe(field.lookup(points[k][0], points[k][1]));
  });

  it('answers the default outside every patch and with no patches at all', () => {
    const empty = new FrictionField({ default: material({ name: 'floor' }), patches: [] });
    expect(empty.lookup(0, 0)).toBe(0);
    const field = new FrictionField(randomMap(10, 3));
    expect(field.lookup(1e6, 1e6)).toBe(0);
  });
});
