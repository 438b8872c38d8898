// What every suite-shaped command (run, margin, bench) does before running anything: parse the
// build specs (names unique), load the scenarios in the one canonical order, and describe each
// build for results.json. A failing parse or load is bad input: the lines say what, nothing runs.

import { existsSync, statSync } from 'node:fs';
import { whichProgram } from '../builds/contentIdentity.js';
import { buildManifest } from '../builds/provenance.js';
import { BuildSpecError, parseBuildSpec, type BuildSpec } from '../builds/spec.js';
import type { BuildManifest } from '../results/types.js';
import { formatIssue, loadSuite } from '../scenario/index.js';
import { DEFAULT_SCENARIO_PATHS } from '../scenario/paths.js';
import type { ResolvedScenario } from '../scenario/types.js';

export type Prepared<T> = { ok: true; value: T; warnings: string[] } | { ok: false; lines: string[] };

/** Parses build specs (already-parsed ones pass through) and refuses a name used twice. */
export function prepareBuilds(command: string, builds: (string | BuildSpec)[], cwd: string, builtElsewhere: ReadonlySet<string> = new Set()): Prepared<BuildSpec[]> {
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
    // Builds made elsewhere (git-ref builds) carry their own failure; the others must exist now.
    const missing = builtElsewhere.has(spec.name) ? null : missingEntry(spec);
    if (missing !== null) return { ok: false, lines: [`--build ${spec.text}: ${missing}; nothing was run`] };
    if (names.has(spec.name)) {
      return { ok: false, lines: [`--build ${spec.text}: the build name "${spec.name}" is used twice; name one of them (NAME=SPEC)`] };
    }
    names.add(spec.name);
  }
  return { ok: true, value: specs, warnings: [] };
}

/**
 * A module file or program that is not there is bad input (exit 2 before anything runs), not an
 * error run per scenario: nothing about the scenarios could change it.
 */
function missingEntry(spec: BuildSpec): string | null {
  if (spec.kind === 'module') {
    if (!existsSync(spec.entry)) return `module file ${spec.entry} does not exist`;
    if (!statSync(spec.entry).isFile()) return `${spec.entry} is not a file (expected an ES module, .js .mjs .ts .mts)`;
  }
  if (spec.kind === 'process' && whichProgram(spec.entry, spec.cwd) === null) {
    return spec.entry.includes('/') ? `program ${spec.entry} does not exist` : `program "${spec.entry}" is not on PATH`;
  }
  return null;
}

/** Loads the suite; scenarios sorted by file then id (the order results and merges use). */
export async function prepareScenarios(command: string, paths: string[] | undefined, cwd: string): Promise<Prepared<ResolvedScenario[]>> {
  const suite = await loadSuite(paths && paths.length > 0 ? paths : [...DEFAULT_SCENARIO_PATHS], { cwd });
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

/**
 * A build prepared before the suite: its spec, its manifest when the preparer knows better than
 * the spec (a git-ref build's origin), or why it could not be prepared — then each of its runs is
 * an `error` run carrying that message and output tail, and the other builds run as usual.
 */
export interface PreparedBuild {
  spec: BuildSpec;
  manifest?: Record<string, unknown>;
  failure?: { message: string; outputTail: string };
}

/** results.json's `builds`: each spec's provenance (git state of its source), or what was prepared. */
export async function buildManifests(specs: readonly BuildSpec[], prepared: ReadonlyMap<string, PreparedBuild> = new Map()): Promise<BuildManifest[]> {
  return Promise.all(
    specs.map(async (spec) => {
      const given = prepared.get(spec.name);
      if (given?.manifest) return { name: spec.name, ...given.manifest };
      if (given?.failure) return { name: spec.name, kind: spec.kind, entry: spec.entry, commit: null, dirty: null };
      const manifest = await buildManifest(spec);
      return { ...manifest, commit: manifest.git?.commit ?? null, dirty: manifest.git?.dirty ?? null };
    }),
  );
}
