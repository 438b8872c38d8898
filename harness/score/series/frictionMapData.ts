// The friction map as the series file stores it: the scenario's own map, with a raster finer than
// MAX_RASTER_CELLS_PER_SIDE block-reduced so a large recorded floor scan cannot bloat every series
// file. A block keeps its lowest μs: the top view must never show a floor grippier than it was.

import type { FrictionMap, Raster } from '../../plant/types.js';
import { MAX_RASTER_CELLS_PER_SIDE } from './types.js';

export function compactFrictionMap(map: FrictionMap, maxCells = MAX_RASTER_CELLS_PER_SIDE): FrictionMap {
  if (!map.raster) return map;
  return { ...map, raster: reduceRaster(map.raster, maxCells) };
}

export function reduceRaster(raster: Raster, maxCells: number): Raster {
  const nx = raster.staticFriction.length;
  const ny = nx > 0 ? raster.staticFriction[0].length : 0;
  const factor = Math.max(1, Math.ceil(Math.max(nx, ny) / maxCells));
  if (factor === 1) return raster;
  const bx = Math.ceil(nx / factor);
  const by = Math.ceil(ny / factor);
  const reduce = (grid: number[][]): number[][] => {
    const out: number[][] = [];
    for (let i = 0; i < bx; i++) {
      const column: number[] = [];
      for (let j = 0; j < by; j++) {
        let lowest = Number.POSITIVE_INFINITY;
        for (let a = i * factor; a < Math.min(nx, (i + 1) * factor); a++) {
          for (let b = j * factor; b < Math.min(ny, (j + 1) * factor); b++) lowest = Math.min(lowest, grid[a][b]);
        }
        column.push(lowest);
      }
      out.push(column);
    }
    return out;
  };
  // Cells beyond the raster's edge in the last block are simply not there: the reduced raster may
  // reach up to (factor − 1) source cells further than the original, a drawing-only approximation.
  return { origin_m: raster.origin_m, cell_m: raster.cell_m * factor, staticFriction: reduce(raster.staticFriction), kineticFriction: reduce(raster.kineticFriction) };
}
