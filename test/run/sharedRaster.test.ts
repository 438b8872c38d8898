import { describe, expect, it } from 'vitest';
import { postedTask, receivedTask } from '../../harness/run/sharedRaster.js';
import type { RunTask } from '../../harness/run/runOne.js';
import { loadScenarioFile } from '../../harness/scenario/index.js';

describe('raster grids posted to run threads in shared memory', () => {
  it('rebuilds the same grids in the thread, packing each raster once', async () => {
    const loaded = await loadScenarioFile(new URL('../../scenarios/checkerboard-tiles.yaml', import.meta.url).pathname);
    expect(loaded.ok).toBe(true);
    if (!loaded.ok) return;
    const scenario = loaded.scenarios[0];
    const raster = scenario.plant.ground.friction.raster!;
    const task = { scenario, build: { name: 'governed', kind: 'reference', id: 'governed' }, outDir: '/tmp/x', trace: false } as unknown as RunTask;
    const first = postedTask(task);
    const second = postedTask(task);
    // The posted scenario carries no grids; the shared buffer is the same for every task.
    expect(first.scenario.plant.ground.friction.raster!.staticFriction).toEqual([]);
    expect(first.sharedRaster!.cells.buffer).toBeInstanceOf(SharedArrayBuffer);
    expect(second.sharedRaster!.cells).toBe(first.sharedRaster!.cells);
    // The caller's scenario is left as it was.
    expect(raster.staticFriction.length).toBe(8);
    // A structured clone, as postMessage makes, then the thread's side.
    const received = receivedTask(structuredClone(first));
    expect(received).toEqual(task);
    expect('sharedRaster' in received).toBe(false);
  });

  it('posts a task without a raster unchanged', async () => {
    const loaded = await loadScenarioFile(new URL('../../scenarios/dry-baseline-walk.yaml', import.meta.url).pathname);
    if (!loaded.ok) throw new Error('dry-baseline-walk.yaml does not load');
    const task = { scenario: loaded.scenarios[0], build: { name: 'governed' }, outDir: '/tmp/x', trace: false } as unknown as RunTask;
    expect(postedTask(task)).toBe(task);
    expect(receivedTask(task)).toBe(task);
  });
});
