import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { writeBigRasterSuite } from '../../harness/bench/bigRaster.js';
import { loadScenarioFile } from '../../harness/scenario/index.js';

describe('bench raster suite', () => {
  const dir = mkdtempSync(path.join(tmpdir(), 'footing-bigraster-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it('writes a valid scenario whose raster has the asked size and the checkerboard values', async () => {
    // 120 cells (not 1000) keeps the test fast; the bench writes the 1000² one the same way.
    const file = writeBigRasterSuite(dir, 120);
    const loaded = await loadScenarioFile(file, { cwd: dir });
    expect(loaded.ok).toBe(true);
    if (!loaded.ok) return;
    const raster = loaded.scenarios[0].plant.ground.friction.raster!;
    expect(raster.staticFriction.length).toBe(120);
    expect(raster.staticFriction[0].length).toBe(120);
    expect(raster.cell_m).toBe(0.01);
    // 0.5 m tiles of 1 cm cells: cell (0, 0) dry, (50, 0) wet, (50, 50) dry.
    expect([raster.staticFriction[0][0], raster.staticFriction[50][0], raster.staticFriction[50][50]]).toEqual([0.9, 0.3, 0.9]);
    expect(raster.kineticFriction[50][0]).toBe(0.22);
  });
});
