// Which scenarios are slippery: those whose lowest static friction coefficient, over the floor's
// default material, its patches and its raster cells, is at most SLIPPERY_STATIC_FRICTION. The
// lowest value is recorded with each run (scenario.lowestStaticFriction), so a results file can be
// read back without the scenario files.

import type { FrictionMap } from '../plant/types.js';

/**
 * μs ≤ 0.6 counts as slippery. Our own line (docs/scoring.md, "Ahead"): below the dry floors of the
 * bundled library (μs 0.8–0.9) and above its wet and icy ones (0.12–0.5), so a wet patch on a dry
 * floor counts and a dry floor does not.
 */
export const SLIPPERY_STATIC_FRICTION = 0.6;

/** The lowest μs anywhere on the map (default material, every patch, every raster cell). */
export function lowestStaticFriction(friction: FrictionMap): number {
  let lowest = friction.default.staticFriction;
  for (const patch of friction.patches) lowest = Math.min(lowest, patch.material.staticFriction);
  const raster = friction.raster;
  if (raster !== undefined) {
    for (const column of raster.staticFriction) for (const cell of column) lowest = Math.min(lowest, cell);
  }
  return lowest;
}

export function isSlippery(lowestStaticFriction: number): boolean {
  return lowestStaticFriction <= SLIPPERY_STATIC_FRICTION;
}
