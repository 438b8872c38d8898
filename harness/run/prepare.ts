// What every suite-shaped command (run, margin) does before running anything: parse the build
// specs (names unique) and load the scenarios in the one canonical order. Either step failing is
// bad input: the lines say what, and nothing runs.

import { BuildSpecError, parseBuildSpec, type BuildSpec } from '../builds/spec.js';
import { formatIssue, loadSuite } from '../scenario/index.js';
import type { ResolvedScenario } from '../scenario/types.js';

export const DEFAULT_SCENARIO_PATHS = ['scenarios'];

export type Prepared<T> = { ok: true; value: T; warnings: string[] } | { ok: false; lines: string[] };

/** Parses build specs (already-parsed ones pass through) and refuses a name used twice. */
export function prepareBuilds(command: string, builds: (string | BuildSpec)[], cwd: string): Prepared<BuildSpec[]> {
  if (builds.length === 0) return { ok: false, lines: [`footing ${command}: no build given (use --build SPEC, e.g. --build ref:governed)`] };
  let specs: BuildSpec[];
  try {
    specs = builds.map((item) => (typeof item === 'string' ? parseBuildSpec(item, cwd) : item));
  } catch (error) {
    if (error instanceof BuildSpecError) return { ok: false, lines: [error.message] };
    throw error;
  }
  const names = new Set<string>();
  for (const spec of specs) {
    if (names.has(spec.name)) {
      return { ok: false, lines: [`--build ${spec.text}: the build name "${spec.name}" is used twice; name one of them (NAME=SPEC)`] };
    }
    names.add(spec.name);
  }
  return { ok: true, value: specs, warnings: [] };
}

/** Loads the suite; scenarios sorted by file then id (the order results and merges use). */
export async function prepareScenarios(command: string, paths: string[] | undefined, cwd: string): Promise<Prepared<ResolvedScenario[]>> {
  const suite = await loadSuite(paths && paths.length > 0 ? paths : DEFAULT_SCENARIO_PATHS, { cwd });
  if (!suite.ok) {
    const lines = [...suite.errors.map(formatIssue), ...suite.files.flatMap((file) => file.errors.map(formatIssue))];
    lines.push(`footing ${command}: nothing was run; fix the scenario errors above (footing check lists them too)`);
    return { ok: false, lines };
  }
  if (suite.scenarios.length === 0) return { ok: false, lines: [`footing ${command}: no scenarios found`] };
  const warnings = suite.files.flatMap((file) => file.warnings.map((issue) => `warning: ${formatIssue(issue)}`));
  const scenarios = [...suite.scenarios].sort((a, b) => compareText(a.file, b.file) || compareText(a.id, b.id));
  return { ok: true, value: scenarios, warnings };
}

export function compareText(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}
