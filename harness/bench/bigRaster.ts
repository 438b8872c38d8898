// An invented 1000 × 1000-cell friction raster suite for the lean-raster bench target: the
// bundled checkerboard scenario with its 8 × 4 map replaced by a 1000² map of 1 cm cells (a
// wet/dry pattern of 0.5 m tiles, the checkerboard's own values) around the robot's walk.

import { copyFileSync, mkdirSync, openSync, closeSync, readFileSync, writeSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const ROOT = fileURLToPath(new URL('../../', import.meta.url));

/** The largest grid the scenario format allows (MAX_RASTER_CELLS_PER_AXIS). */
export const BIG_RASTER_CELLS = 1000;

/** Writes `dir`/scenarios/{big-raster.yaml, maps/big-1000.csv, robot}; returns the scenario path. */
export function writeBigRasterSuite(dir: string, cells = BIG_RASTER_CELLS): string {
  const suite = path.join(dir, 'scenarios');
  mkdirSync(path.join(suite, 'maps'), { recursive: true });
  const source = readFileSync(path.join(ROOT, 'scenarios', 'checkerboard-tiles.yaml'), 'utf8');
  const robot = /^robot:\s*(\S+)/m.exec(source)?.[1];
  if (!robot) throw new Error('checkerboard-tiles.yaml names no robot file');
  mkdirSync(path.dirname(path.join(suite, robot)), { recursive: true });
  copyFileSync(path.join(ROOT, 'scenarios', robot), path.join(suite, robot));
  const cell_m = 0.01;
  const scenario = source
    .replace(/^id: .*$/m, 'id: big-raster')
    .replace(/^\$schema: .*\n/m, '')
    .replace(/origin_m: \[0\.5, -1\.0\]/, `origin_m: [-1.0, ${-(cells * cell_m) / 2}]`)
    .replace(/cell_m: 0\.5/, `cell_m: ${cell_m}`)
    .replace(/file: maps\/checkerboard-8x4\.csv/, 'file: maps/big-1000.csv');
  if (!scenario.includes('maps/big-1000.csv')) throw new Error('checkerboard-tiles.yaml no longer has the raster block this bench edits');
  const file = path.join(suite, 'big-raster.yaml');
  writeFileSync(file, scenario);
  const fd = openSync(path.join(suite, 'maps', 'big-1000.csv'), 'w');
  try {
    writeSync(fd, '# invented 1000 x 1000 raster for the bench: 0.5 m wet/dry tiles of 1 cm cells\ni,j,staticFriction,kineticFriction\n');
    const tile = Math.round(0.5 / cell_m);
    for (let i = 0; i < cells; i++) {
      let rows = '';
      for (let j = 0; j < cells; j++) rows += (Math.floor(i / tile) + Math.floor(j / tile)) % 2 === 1 ? `${i},${j},0.3,0.22\n` : `${i},${j},0.9,0.7\n`;
      writeSync(fd, rows);
    }
  } finally {
    closeSync(fd);
  }
  return file;
}
