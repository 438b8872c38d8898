// The plant skips the friction lookup of a foot whose (x, y) has not changed since its last one.
// That is a shortcut, not a rule: over whole walks across patches and a raster, every foot's μs
// at every tick is the one a fresh lookup at its position gives.

import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { openBuild } from '../../harness/builds/loader.js';
import { parseBuildSpec } from '../../harness/builds/spec.js';
import { FrictionField } from '../../harness/plant/frictionMap.js';
import { runEpisode } from '../../harness/run/episode.js';
import { controllerSetup } from '../../harness/run/runOne.js';
import { loadScenarioFile } from '../../harness/scenario/load.js';

const ROOT = path.resolve(import.meta.dirname, '../..');

describe('material under each foot', () => {
  for (const file of ['mopped-corridor-crossing.yaml', 'checkerboard-tiles.yaml']) {
    it(`is a fresh lookup at the foot's position at every tick (${file}, governed walk)`, async () => {
      const loaded = await loadScenarioFile(path.join(ROOT, 'scenarios', file), { cwd: ROOT });
      if (!loaded.ok) throw new Error(`${file} did not load`);
      const scenario = loaded.scenarios[0];
      const field = new FrictionField(scenario.plant.ground.friction);
      const build = await openBuild(parseBuildSpec('ref:governed', ROOT), controllerSetup(scenario), {});
      let checked = 0;
      let changes = 0;
      let mismatches = 0;
      const last = new Float64Array(4).fill(Number.NaN);
      try {
        await runEpisode(scenario, build, {
          observers: [{
            onTick(sample) {
              for (let i = 0; i < sample.footStaticFriction.length; i++) {
                const fresh = field.materials.staticFriction[field.lookup(sample.footPosition_m[3 * i], sample.footPosition_m[3 * i + 1])];
                if (sample.footStaticFriction[i] !== fresh) mismatches++;
                if (!Number.isNaN(last[i]) && last[i] !== fresh) changes++;
                last[i] = fresh;
                checked++;
              }
            },
          }],
        });
      } finally {
        await build.close();
      }
      expect(mismatches).toBe(0);
      expect(checked).toBeGreaterThan(1000);
      expect(changes).toBeGreaterThan(0); // feet did cross from one material to another
    });
  }
});
