// The commands behind footing.config.yaml, without the CLI: `footing run` with suites, config and
// git-ref builds (runConfiguredSuite), `footing config --print` (printConfig) and
// `footing cache --clear` (clearCache). Each returns { exitCode, lines }.

import { clearGitCache, GitRefError, prepareGitBuild, resolveRef } from '../builds/git.js';
import { displayPath } from '../scenario/paths.js';
import { EXIT, runSuite, type ExitCode, type PreparedBuild, type SuiteRunOutcome } from '../run/suite.js';
import { describeOrigin, itemLabel, resolveSettings, settingsErrorLines, type ResolvedBuild, type ResolvedSettings, type RunFlags } from '../config/resolve.js';
import type { Origin } from '../config/types.js';

export interface CommandOutcome {
  exitCode: ExitCode;
  lines: string[];
}

export interface ConfiguredRunOptions {
  /** Called with each line as it happens (progress, build steps); lines are returned too. */
  log?: (line: string) => void;
  /** Passed to runSuite (tests shorten it). */
  runTimeout?: { base_s: number; perSimulatedSecond: number };
}

/**
 * `footing run` with the config file: resolves the settings, builds every git-ref build (from the
 * cache when its commit was built before), then runs the suite. Bad input — config errors, an
 * unknown suite or build, a ref that names no commit — is exit 2 with nothing run; a build command
 * that fails or leaves no entry makes that build's runs `error` runs (exit 1), the rest still run.
 */
export async function runConfiguredSuite(flags: RunFlags, options: ConfiguredRunOptions = {}): Promise<CommandOutcome & { results?: SuiteRunOutcome['results'] }> {
  const lines: string[] = [];
  const log = (line: string) => {
    lines.push(line);
    options.log?.(line);
  };
  let settings: ResolvedSettings;
  try {
    settings = resolveSettings(flags);
  } catch (error) {
    const problem = settingsErrorLines(error);
    if (problem === null) throw error;
    for (const line of problem) log(line);
    log('footing run: nothing was run; fix the configuration above (footing config --print shows what was resolved)');
    return { exitCode: EXIT.badInput, lines };
  }

  // Every ref is resolved before anything is built: a typo in the last ref should not cost a build.
  const refProblems: string[] = [];
  for (const build of settings.builds) {
    if (build.kind !== 'git') continue;
    try {
      await resolveRef(build.recipe.repo, build.recipe.ref);
    } catch (error) {
      if (!(error instanceof GitRefError)) throw error;
      refProblems.push(`${itemLabel(build.origin)}: ${error.message}`);
    }
  }
  if (refProblems.length > 0) {
    for (const line of refProblems) log(line);
    log('footing run: nothing was run; fix the refs above');
    return { exitCode: EXIT.badInput, lines };
  }

  const prepared: PreparedBuild[] = [];
  for (const build of settings.builds) {
    if (build.kind === 'spec') {
      prepared.push({ spec: build.spec });
      continue;
    }
    const started = performance.now();
    const outcome = await prepareGitBuild(build.recipe);
    const took = ((performance.now() - started) / 1000).toFixed(1);
    if (outcome.ok) {
      log(`build ${build.name}: git ${build.recipe.ref} → ${outcome.origin.commit.slice(0, 12)} ${outcome.origin.cached ? '(cached)' : `(built in ${took} s)`}`);
      prepared.push({ spec: outcome.spec, manifest: outcome.manifest });
    } else {
      const message = `${itemLabel(build.origin)}: ${outcome.message}`;
      log(`build ${build.name} FAILED: ${message}`);
      if (outcome.outputTail !== '') for (const line of outcome.outputTail.split('\n')) log(`  | ${line}`);
      prepared.push({
        spec: { name: build.name, kind: build.recipe.kind, entry: build.recipe.entry, args: [], options: {}, cwd: build.recipe.repo, text: `${build.name}=${build.text}` },
        manifest: { name: build.name, kind: build.recipe.kind, entry: build.recipe.entry, commit: outcome.origin.commit ?? null, dirty: null, origin: { repo: build.recipe.repo, ref: build.recipe.ref, commit: outcome.origin.commit ?? null, build: build.recipe.build ?? null, failed: true } },
        failure: { message, outputTail: outcome.outputTail },
      });
    }
  }
  if (settings.bench.value) log(`bench: on (${describeOrigin(settings.bench.origin)}); figures attached to results.json`);

  const outcome = await runSuite({
    paths: settings.paths.value,
    builds: prepared,
    outDir: settings.out.value,
    trace: settings.trace.value,
    jobs: settings.jobs.value,
    shard: flags.shard,
    baseline: settings.baseline.value,
    policyFile: settings.policy.value.file,
    policy: settings.policy.value.inline,
    loopBudget_us: settings.loopBudget_us.value,
    resume: flags.resume,
    quiet: flags.quiet,
    bench: settings.bench.value,
    runTimeout: options.runTimeout,
    cwd: settings.cwd,
    log,
  });
  return { exitCode: outcome.exitCode, lines, results: outcome.results };
}

/** `footing config --print`: every resolved setting and where it came from (file, flag, default). */
export async function printConfig(flags: RunFlags, options: { json?: boolean } = {}): Promise<CommandOutcome> {
  let settings: ResolvedSettings;
  try {
    settings = resolveSettings(flags);
  } catch (error) {
    const problem = settingsErrorLines(error);
    if (problem === null) throw error;
    return { exitCode: EXIT.badInput, lines: problem };
  }
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

/** `footing cache --clear`: removes the git-build cache of the project (worktrees unregistered). */
export async function clearCache(flags: RunFlags): Promise<CommandOutcome> {
  let settings: ResolvedSettings;
  try {
    settings = resolveSettings({ ...flags, suite: undefined, builds: undefined, baseline: undefined, paths: undefined });
  } catch (error) {
    const problem = settingsErrorLines(error);
    if (problem === null) throw error;
    return { exitCode: EXIT.badInput, lines: problem };
  }
  const outcome = await clearGitCache(settings.cache.value);
  return { exitCode: EXIT.pass, lines: outcome.lines.map((line) => line.replace(settings.cache.value, displayPath(settings.cache.value, settings.cwd))) };
}
