import { describe, expect, it } from 'vitest';
import { FrictionField } from '../../harness/plant/frictionMap.js';
import { SeededRandom } from '../../harness/plant/random.js';
import type { FrictionMap, Material } from '../../harness/plant/types.js';
import { material } from '../support/robots.js';

const dry = material({ name: 'dry' });
const named = (name: string, mus: number): Material => material({ name, staticFriction: mus, kineticFriction: mus * 0.7 });

const map: FrictionMap = {
  default: dry,
  patches: [
    { name: 'strip', shape: { kind: 'polygon', vertices_m: [[1, -2], [1.6, -2], [3.6, 2], [3, 2]] }, material: named('strip', 0.15) },
    { name: 'spill', shape: { kind: 'circle', center_m: [3.2, 1.5], radius_m: 0.6 }, material: named('spill', 0.2) },
    { name: 'mat', shape: { kind: 'rect', min_m: [2.5, 1], max_m: [3.5, 3] }, material: named('mat', 1.0) },
  ],
  raster: {
    origin_m: [-2, -2],
    cell_m: 0.25,
    staticFriction: Array.from({ length: 16 }, (_, i) => Array.from({ length: 12 }, (_, j) => ((i + j) % 2 ? 0.3 : 0.6))),
    kineticFriction: Array.from({ length: 16 }, (_, i) => Array.from({ length: 12 }, (_, j) => ((i + j) % 2 ? 0.2 : 0.5))),
  },
};

/** Straightforward reference: every rule written the obvious way, no precomputation. */
function bruteForce(x: number, y: number): number {
  for (let p = map.patches.length - 1; p >= 0; p--) {
    const s = map.patches[p].shape;
    if (s.kind === 'rect' && x >= s.min_m[0] && x <= s.max_m[0] && y >= s.min_m[1] && y <= s.max_m[1]) return map.patches[p].material.staticFriction;
    if (s.kind === 'circle' && Math.hypot(x - s.center_m[0], y - s.center_m[1]) <= s.radius_m) return map.patches[p].material.staticFriction;
    if (s.kind === 'polygon') {
      // Winding number (Hormann & Agathos 2001) rather than the crossing test the plant uses.
      let winding = 0;
      const v = s.vertices_m;
      for (let k = 0; k < v.length; k++) {
        const [xa, ya] = v[k];
        const [xb, yb] = v[(k + 1) % v.length];
        const cross = (xb - xa) * (y - ya) - (x - xa) * (yb - ya);
        if (ya <= y && yb > y && cross > 0) winding++;
        else if (ya > y && yb <= y && cross < 0) winding--;
      }
      if (winding !== 0) return map.patches[p].material.staticFriction;
    }
  }
  const r = map.raster!;
  const i = Math.floor((x - r.origin_m[0]) / r.cell_m);
  const j = Math.floor((y - r.origin_m[1]) / r.cell_m);
  if (i >= 0 && j >= 0 && i < r.staticFriction.length && j < r.staticFriction[0].length) return r.staticFriction[i][j];
  return map.default.staticFriction;
}

describe('friction map lookup', () => {
  const field = new FrictionField(map);
  const mus = (x: number, y: number) => field.materials.staticFriction[field.lookup(x, y)];

  it('gives a point in overlapping patches the later patch', () => {
    // (3.2, 1.5) lies in the strip, the spill and the mat: the mat is last.
    expect(mus(3.2, 1.5)).toBe(1.0);
    // (3.0, 0.95): strip and spill (not the mat): the spill is later.
    expect(mus(3.0, 0.95)).toBe(0.2);
    expect(mus(1.3, -1.9)).toBe(0.15);
    expect(mus(10, 10)).toBe(0.9);
  });

  it('gives raster cells where no patch covers, and the default outside the raster', () => {
    expect(mus(-1.9, -1.9)).toBe(0.6);
    expect(mus(-1.7, -1.9)).toBe(0.3);
    expect(mus(-2.1, 0)).toBe(0.9);
  });

  it('matches a brute-force reference at 10,000 random points', () => {
    const random = new SeededRandom(42);
    let mismatches = 0;
    for (let k = 0; k < 10_000; k++) {
      const x = -3 + 8 * random.uniform();
      const y = -3 + 7 * random.uniform();
      if (mus(x, y) !== bruteForce(x, y)) mismatches++;
    }
    expect(mismatches).toBe(0);
  });
});
