// Friction identification on the invented demo log, checked against the truth it was made with
// (examples/recorded/demo-truth.yaml): dry concrete μs 0.9 / μk 0.7, a wet strip x ∈ [1.6, 3.2) m
// with μs 0.2 / μk 0.12. The map's 0.8 m grid is aligned with the strip, so each cell is one floor.

import { beforeAll, describe, expect, it } from 'vitest';
import { importSettings } from '../../harness/recorded/defaults.js';
import { identifyFriction, type FrictionIdentification } from '../../harness/recorded/friction.js';
import { readRecording } from '../../harness/recorded/importLog.js';
import { loadLogMap } from '../../harness/recorded/map.js';
import { DEMO_CSV, DEMO_MAP } from './support.js';

const WET = { staticFriction: 0.2, kineticFriction: 0.12 };
const DRY = { staticFriction: 0.9, kineticFriction: 0.7 };
const truthAt = (x_m: number) => (x_m >= 1.6 && x_m < 3.2 ? WET : DRY);

describe('friction identification', () => {
  let id: FrictionIdentification;
  beforeAll(async () => {
    const map = await loadLogMap(DEMO_MAP);
    if (!map.ok) throw new Error('demo map does not load');
    const read = await readRecording(DEMO_CSV, map.loaded, process.cwd());
    if (!read.ok) throw new Error(read.lines.join('\n'));
    const settings = importSettings(map.loaded.map);
    id = identifyFriction(read.trajectory, settings.friction, settings.forceNoise_N);
  });

  it('brackets the true μs and μk in every cell where it reports slides', () => {
    const slid = id.regions.filter((r) => r.verdict === 'slid');
    expect(slid.length).toBeGreaterThanOrEqual(3);
    for (const r of slid) {
      const truth = truthAt((r.min_m[0] + r.max_m[0]) / 2);
      expect(r.staticFriction!.lower, `cell ${r.i},${r.j}`).toBeLessThanOrEqual(truth.staticFriction);
      expect(r.staticFriction!.upper, `cell ${r.i},${r.j}`).toBeGreaterThanOrEqual(truth.staticFriction);
      expect(r.kineticFriction!.lower, `cell ${r.i},${r.j}`).toBeLessThanOrEqual(truth.kineticFriction);
      expect(r.kineticFriction!.upper, `cell ${r.i},${r.j}`).toBeGreaterThanOrEqual(truth.kineticFriction);
    }
  });

  it('finds the slides on the wet strip and nowhere on the dry floor', () => {
    for (const r of id.regions) {
      const wet = truthAt((r.min_m[0] + r.max_m[0]) / 2) === WET;
      if (!wet) expect(r.verdict, `cell ${r.i},${r.j}`).toBe('lowerBoundOnly');
    }
    // The strip cells the robot's feet slid in with at least three slide events are identified.
    for (const r of id.regions.filter((g) => g.slideEvents >= 3)) expect(r.verdict).toBe('slid');
  });

  it('reports a lower bound only where no foot slid, and the bound holds', () => {
    for (const r of id.regions) {
      const truth = truthAt((r.min_m[0] + r.max_m[0]) / 2);
      if (r.staticLowerBound !== null) expect(r.staticLowerBound, `cell ${r.i},${r.j}`).toBeLessThanOrEqual(truth.staticFriction);
      if (r.samples.slide === 0) {
        expect(r.verdict).toBe('lowerBoundOnly');
        expect(r.kineticFriction).toBeUndefined();
        expect(r.reason).toBe('no foot slid here');
      }
    }
  });
});
