// A friction raster crosses to the run threads once, in shared memory. Posted as part of a task,
// its grids (a million cells each at 1000²) would be serialised for every run and come back in
// each thread as arrays of boxed numbers (about three times the doubles' size). Instead the pool
// packs each raster once into a SharedArrayBuffer (kept for every later task of the same
// scenario), posts the task with empty grids beside that buffer, and the thread rebuilds the
// grids from it: the same values, read from memory both sides already share.

import type { Raster } from '../plant/types.js';
import type { ResolvedScenario } from '../scenario/types.js';
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

/** A scenario as posted to a thread: its raster's grids, when it has one, in `sharedRaster`. */
export type PostedScenario = { scenario: ResolvedScenario; sharedRaster?: SharedRasterGrids };

/** The scenario to post: unchanged without a raster; else its grids moved to shared memory (once per raster). */
export function postedScenario(scenario: ResolvedScenario): PostedScenario {
  // Optional chaining: test doubles of the pool post tasks without a scenario.
  const friction = scenario?.plant?.ground?.friction;
  const raster = friction?.raster;
  if (!friction || !raster) return { scenario };
  const sharedRaster = pack(raster);
  const lean: Raster = { ...raster, staticFriction: [], kineticFriction: [] };
  const plant = scenario.plant;
  return { scenario: { ...scenario, plant: { ...plant, ground: { ...plant.ground, friction: { ...friction, raster: lean } } } }, sharedRaster };
}

/** The thread's side: the scenario with its raster grids rebuilt from shared memory. */
export function receivedScenario(posted: PostedScenario): ResolvedScenario {
  const { scenario, sharedRaster } = posted;
  const raster = scenario.plant.ground.friction.raster;
  if (!sharedRaster || !raster) return scenario;
  const { nx, ny, cells } = sharedRaster;
  const staticFriction: number[][] = [];
  const kineticFriction: number[][] = [];
  for (let i = 0; i < nx; i++) {
    staticFriction.push(Array.from(cells.subarray(i * ny, (i + 1) * ny)));
    kineticFriction.push(Array.from(cells.subarray(nx * ny + i * ny, nx * ny + (i + 1) * ny)));
  }
  raster.staticFriction = staticFriction;
  raster.kineticFriction = kineticFriction;
  return scenario;
}

/** The task to post: unchanged without a raster; else its grids moved to shared memory (once per raster). */
export function postedTask(task: RunTask): PostedTask {
  const { scenario, sharedRaster } = postedScenario(task.scenario);
  return sharedRaster ? { ...task, scenario, sharedRaster } : task;
}

/** The thread's side: the task with its raster grids rebuilt from shared memory. */
export function receivedTask(posted: PostedTask): RunTask {
  if (!posted.sharedRaster) return posted;
  const { sharedRaster, ...task } = posted;
  return { ...task, scenario: receivedScenario({ scenario: task.scenario, sharedRaster }) };
}
