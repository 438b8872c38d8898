// A friction raster crosses to the run threads once, in shared memory. Posted as part of a task,
// its grids (a million cells each at 1000²) would be serialised for every run and come back in
// each thread as arrays of boxed numbers (about three times the doubles' size). Instead the pool
// packs each raster once into a SharedArrayBuffer (kept for every later task of the same
// scenario), posts the task with empty grids beside that buffer, and the thread rebuilds the
// grids from it: the same values, read from memory both sides already share.

import type { Raster } from '../plant/types.js';
import type { RunTask } from './runOne.js';

/** μs then μk, each nx × ny, indexed i·ny + j (the raster's [i][j]). */
export interface SharedRasterGrids {
  nx: number;
  ny: number;
  cells: Float64Array;
}

/** A task as posted to a run thread: the raster's grids, when it has one, in `sharedRaster`. */
export type PostedTask = RunTask & { sharedRaster?: SharedRasterGrids };

const packed = new WeakMap<Raster, SharedRasterGrids>();

function pack(raster: Raster): SharedRasterGrids {
  const known = packed.get(raster);
  if (known) return known;
  const nx = raster.staticFriction.length;
  const ny = nx > 0 ? raster.staticFriction[0].length : 0;
  const cells = new Float64Array(new SharedArrayBuffer(2 * nx * ny * Float64Array.BYTES_PER_ELEMENT));
  for (let i = 0; i < nx; i++) {
    const s = raster.staticFriction[i];
    const k = raster.kineticFriction[i];
    for (let j = 0; j < ny; j++) {
      cells[i * ny + j] = s[j];
      cells[nx * ny + i * ny + j] = k[j];
    }
  }
  const grids = { nx, ny, cells };
  packed.set(raster, grids);
  return grids;
}

/** The task to post: unchanged without a raster; else its grids moved to shared memory (once per raster). */
export function postedTask(task: RunTask): PostedTask {
  // Optional chaining: test doubles of the pool post tasks without a scenario.
  const friction = task.scenario?.plant?.ground?.friction;
  const raster = friction?.raster;
  if (!friction || !raster) return task;
  const sharedRaster = pack(raster);
  const lean: Raster = { ...raster, staticFriction: [], kineticFriction: [] };
  const plant = task.scenario.plant;
  return { ...task, scenario: { ...task.scenario, plant: { ...plant, ground: { ...plant.ground, friction: { ...friction, raster: lean } } } }, sharedRaster };
}

/** The thread's side: the task with its raster grids rebuilt from shared memory. */
export function receivedTask(posted: PostedTask): RunTask {
  if (!posted.sharedRaster) return posted;
  const { sharedRaster, ...task } = posted;
  const raster = task.scenario.plant.ground.friction.raster;
  if (!raster) return task;
  const { nx, ny, cells } = sharedRaster;
  const staticFriction: number[][] = [];
  const kineticFriction: number[][] = [];
  for (let i = 0; i < nx; i++) {
    staticFriction.push(Array.from(cells.subarray(i * ny, (i + 1) * ny)));
    kineticFriction.push(Array.from(cells.subarray(nx * ny + i * ny, nx * ny + (i + 1) * ny)));
  }
  raster.staticFriction = staticFriction;
  raster.kineticFriction = kineticFriction;
  return task;
}
