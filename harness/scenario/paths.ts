// References from a scenario to other files (robot, CSV series, raster) are relative to the
// scenario file and must stay inside the suite folder: a scenario under review must not be able
// to read arbitrary files of the machine it runs on.

import path from 'node:path';

/** What run, margin and check read when no scenario path is given. */
export const DEFAULT_SCENARIO_PATHS: readonly string[] = ['scenarios'];

export type ReferenceOutcome = { ok: true; absolute: string } | { ok: false; message: string };

export function resolveReference(reference: string, scenarioFile: string, suiteRoot: string): ReferenceOutcome {
  if (path.isAbsolute(reference) || /^[a-zA-Z]:[\\/]/.test(reference)) {
    return { ok: false, message: `"${reference}" is an absolute path (expected a path relative to the scenario file, inside the suite folder)` };
  }
  const absolute = path.resolve(path.dirname(scenarioFile), reference);
  if (!isInside(absolute, suiteRoot)) {
    return {
      ok: false,
      message: `"${reference}" resolves to ${absolute}, outside the suite folder ${suiteRoot} (references must stay inside the suite folder; ".." may not climb out of it)`,
    };
  }
  return { ok: true, absolute };
}

export function isInside(absolute: string, root: string): boolean {
  const rel = path.relative(root, absolute);
  return rel === '' || (!rel.startsWith('..') && !path.isAbsolute(rel));
}

/** How a file is named in messages: relative to the working directory when inside it. */
export function displayPath(absolute: string, cwd = process.cwd()): string {
  return isInside(absolute, cwd) ? path.relative(cwd, absolute).split(path.sep).join('/') || '.' : absolute;
}

/** The suite-relative name stored in ResolvedScenario.file (forward slashes on every platform). */
export function suiteRelative(absolute: string, suiteRoot: string): string {
  return path.relative(suiteRoot, absolute).split(path.sep).join('/');
}
