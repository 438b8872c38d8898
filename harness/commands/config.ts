// `footing config --print`: the resolved settings of footing.config.yaml, flags and defaults, and
// where each came from. Also the one way every config-reading command (run, config, cache) turns
// a broken configuration into bad input.

import { GitRefError, resolveRef } from '../builds/git.js';
import { displayPath } from '../scenario/paths.js';
import { describeOrigin, resolveSettings, settingsErrorLines, type ResolvedBuild, type ResolvedSettings, type RunFlags } from '../config/resolve.js';
import type { Origin } from '../config/types.js';
import { EXIT, type ExitCode } from './exit.js';
import type { CommandOutcome } from './skeleton.js';

/** The resolved settings, or the lines that say why the configuration is bad input. */
export function resolveForCommand(flags: RunFlags): { ok: true; settings: ResolvedSettings } | { ok: false; lines: string[] } {
  try {
    return { ok: true, settings: resolveSettings(flags) };
  } catch (error) {
    const problem = settingsErrorLines(error);
    if (problem === null) throw error;
    return { ok: false, lines: problem };
  }
}

/** `footing config --print`: every resolved setting and where it came from (file, flag, default). */
export async function printConfig(flags: RunFlags, options: { json?: boolean } = {}): Promise<CommandOutcome> {
  const resolved = resolveForCommand(flags);
  if (!resolved.ok) return { exitCode: EXIT.badInput, lines: resolved.lines };
  const settings = resolved.settings;
  const cwd = settings.cwd;
  const show = (p: string) => displayPath(p, cwd);
  let exitCode: ExitCode = EXIT.pass;
  const builds: { name: string; spec: string; commit?: string; problem?: string; origin: Origin }[] = [];
  for (const build of settings.builds) {
    const row: (typeof builds)[number] = { name: build.name, spec: describeBuild(build), origin: build.origin };
    if (build.kind === 'git') {
      try {
        row.commit = (await resolveRef(build.recipe.repo, build.recipe.ref)).commit;
      } catch (error) {
        if (!(error instanceof GitRefError)) throw error;
        row.problem = error.message;
        exitCode = EXIT.badInput;
      }
    }
    builds.push(row);
  }
  const entries: [string, unknown, Origin][] = [
    ['suite', settings.suite?.value ?? null, settings.suite?.origin ?? { from: 'default' }],
    ['scenarios', settings.paths.value.map(show), settings.paths.origin],
    ['baseline', settings.baseline.value ?? null, settings.baseline.origin],
    ['gate', settings.policy.value.file ? show(settings.policy.value.file) : settings.policy.value.inline ? 'inline' : 'defaults (docs/scoring.md)', settings.policy.origin],
    ['jobs', settings.jobs.value ?? 'core count', settings.jobs.origin],
    ['out', show(settings.out.value), settings.out.origin],
    ['trace', settings.trace.value, settings.trace.origin],
    ['loopBudget_us', settings.loopBudget_us.value ?? "each scenario's own", settings.loopBudget_us.origin],
    ['bench', settings.bench.value, settings.bench.origin],
    ['cache', show(settings.cache.value), settings.cache.origin],
  ];
  if (options.json) {
    const json = {
      config: settings.config ? settings.config.display : null,
      settings: Object.fromEntries(entries.map(([key, value, origin]) => [key, { value, origin }])),
      builds: builds.map((b) => ({ name: b.name, spec: b.spec, commit: b.commit ?? null, problem: b.problem ?? null, origin: b.origin })),
    };
    return { exitCode, lines: JSON.stringify(json, null, 2).split('\n') };
  }
  const lines = [`config file: ${settings.config ? settings.config.display : `none (no footing.config.yaml in ${show(cwd)})`}`];
  const width = 14;
  const cell = (value: unknown) => (Array.isArray(value) ? value.join(', ') : value === null ? '(none)' : String(value));
  for (const [key, value, origin] of entries) lines.push(`${key.padEnd(width)} ${cell(value)}    [${describeOrigin(origin)}]`);
  lines.push(`${'builds'.padEnd(width)} [${describeOrigin(settings.buildsOrigin)}]`);
  for (const b of builds) {
    const commit = b.commit ? ` → ${b.commit.slice(0, 12)}` : b.problem ? ` → ERROR: ${b.problem}` : '';
    lines.push(`  ${b.name.padEnd(width - 2)} ${b.spec}${commit}    [${describeOrigin(b.origin)}]`);
  }
  return { exitCode, lines };
}

function describeBuild(build: ResolvedBuild): string {
  if (build.kind === 'spec') return build.text;
  const r = build.recipe;
  return `git:${r.ref} (repo ${r.repo}, build ${r.build ? JSON.stringify(r.build) : 'none'}, entry ${r.entry}, ${r.kind})`;
}
