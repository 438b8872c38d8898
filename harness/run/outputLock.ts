// One writer per results folder. `footing run` deletes saved runs it does not resume and rewrites
// every summary file, so two runs into one --out would delete each other's work; the second one is
// refused (exit 2, nothing run) with the first one's pid. A lock left by a killed run (dead pid)
// is taken over. And deletion never follows a symbolic link inside the folder: runs/ and traces/
// must be real folders, or every *.json in some other folder could be deleted.

import { lstatSync, mkdirSync } from 'node:fs';
import path from 'node:path';
import { tryLock } from '../files/lock.js';

export const OUTPUT_LOCK_NAME = '.footing-lock';

export class OutputFolderError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'OutputFolderError';
  }
}

/** Locks `outDir` for this process; returns the release function, or throws OutputFolderError. */
export function lockOutputFolder(outDir: string, log?: (line: string) => void): () => void {
  mkdirSync(outDir, { recursive: true });
  const file = path.join(outDir, OUTPUT_LOCK_NAME);
  const attempt = tryLock(file, 'footing run');
  if (!attempt.ok) {
    const { pid, host, startedAt } = attempt.owner;
    throw new OutputFolderError(
      `${outDir} is being written by another footing run (pid ${pid} on ${host}, since ${startedAt}); wait for it to finish or choose another --out (the lock is ${file})`,
    );
  }
  if (attempt.takenOver !== null) log?.(`took over the lock of ${outDir} left by pid ${attempt.takenOver.pid}, which is no longer running`);
  return attempt.release;
}

/** Makes `dir` a real folder (creating it), refusing a symbolic link or a file in its place. */
export function realFolder(dir: string): string {
  let info;
  try {
    info = lstatSync(dir);
  } catch {
    mkdirSync(dir, { recursive: true });
    return dir;
  }
  if (info.isSymbolicLink()) {
    throw new OutputFolderError(`${dir} is a symbolic link; footing deletes files there and never follows a link to do so (make it a real folder or remove it)`);
  }
  if (!info.isDirectory()) throw new OutputFolderError(`${dir} exists but is not a folder (expected a folder footing may write into)`);
  return dir;
}
