// Shared set-up of the recorded-run tests: the invented demo log, its map, and temporary folders.

import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';

export const REPO = path.resolve(import.meta.dirname, '..', '..');
export const DEMO_DIR = path.join(REPO, 'examples', 'recorded');
export const DEMO_CSV = path.join(DEMO_DIR, 'demo-wet-hall.csv');
export const DEMO_MCAP = path.join(DEMO_DIR, 'demo-wet-hall.mcap');
export const DEMO_MAP = path.join(DEMO_DIR, 'demo-wet-hall.map.yaml');
export const ROBOT = path.join(REPO, 'scenarios', 'robots', 'quad-24kg.yaml');

export function tempDir(prefix: string): string {
  return mkdtempSync(path.join(tmpdir(), `footing-${prefix}-`));
}

/** The demo map with text replacements, written into `dir` (robot path made absolute). */
export function writeMap(dir: string, replace: [string | RegExp, string][] = [], name = 'map.yaml'): string {
  let text = readFileSync(DEMO_MAP, 'utf8').replace('robot: ../../scenarios/robots/quad-24kg.yaml', `robot: ${ROBOT}`);
  for (const [from, to] of replace) text = text.replace(from, to);
  const file = path.join(dir, name);
  writeFileSync(file, text);
  return file;
}

/** The demo CSV with its lines transformed, written into `dir`. */
export function writeCsv(dir: string, transform: (lines: string[]) => string[], name = 'log.csv'): string {
  const lines = readFileSync(DEMO_CSV, 'utf8').split('\n');
  const file = path.join(dir, name);
  writeFileSync(file, transform(lines).join('\n'));
  return file;
}
