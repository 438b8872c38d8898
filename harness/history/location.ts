// Where the history store lives: `--store FILE`, else the config's `history` path (relative to
// footing.config.yaml), else DEFAULT_HISTORY_FILE in the project (the config's folder, or the
// working directory). The default folder ignores itself (a `.gitignore` of `*`), so the store is
// git-ignored in the controller repository with nothing to add by hand.

import { existsSync, mkdirSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import type { LoadedConfig } from '../config/load.js';

/** The project's Footing folder and the store file in it. */
export const FOOTING_FOLDER = '.footing';
export const DEFAULT_HISTORY_FILE = `${FOOTING_FOLDER}/history.sqlite`;

export function storePath(options: { store?: string; config: LoadedConfig | null; cwd: string }): string {
  if (options.store !== undefined) return path.resolve(options.cwd, options.store);
  const project = options.config?.dir ?? options.cwd;
  return path.resolve(project, options.config?.data.history ?? DEFAULT_HISTORY_FILE);
}

/** Creates the store's folder; the default Footing folder gets its self-ignoring .gitignore. */
export function prepareStoreFolder(file: string): void {
  const folder = path.dirname(file);
  if (path.basename(folder) === FOOTING_FOLDER && !existsSync(path.join(folder, '.gitignore'))) {
    mkdirSync(folder, { recursive: true });
    writeFileSync(path.join(folder, '.gitignore'), '# Footing\'s own files (history store); never committed.\n*\n');
  }
  mkdirSync(folder, { recursive: true });
}
