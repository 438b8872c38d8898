// Flags over footing.config.yaml over defaults: the settings of one `footing run`, each with the
// place it came from, so `footing config --print` can say why a value is what it is and every
// later error can point at the line that asked for it.
//
// Paths from the file are relative to the file's folder (the project); paths from flags are
// relative to the working directory.

import { existsSync } from 'node:fs';
import path from 'node:path';
import type { GitBuildRecipe } from '../builds/git.js';
import { BuildSpecError, parseBuildSpec, type BuildSpec } from '../builds/spec.js';
import type { GatePolicy } from '../gate/defaults.js';
import { formatPolicyIssue } from '../gate/policy.js';
import { displayPath } from '../scenario/paths.js';
import { DEFAULT_BUILDS, DEFAULT_CACHE_DIR, DEFAULT_OUT_DIR, DEFAULT_SCENARIO_PATHS } from './defaults.js';
import { expandGlob, isGlob } from './glob.js';
import { ConfigError, findConfigFile, gitRefOfSpec, loadConfig, recipeOf, type LoadedConfig } from './load.js';
import { didYouMean } from '../files/suggest.js';
import type { FileIssue } from '../files/issue.js';
import type { ScenarioSelection } from '../scenario/select.js';
import type { GitBuildData, Origin, Sourced, SuiteData } from './types.js';

/** The flags of `footing run` (and `config --print`, `cache --clear`) as plain data. */
export interface RunFlags {
  /** --config FILE; default: footing.config.yaml in cwd, if there is one. */
  config?: string;
  suite?: string;
  /** Positional scenario paths. */
  paths?: string[];
  /** --build SPEC (repeatable); `NAME=git:REF` uses the config file's git recipe. */
  builds?: string[];
  baseline?: string;
  policy?: string;
  jobs?: number;
  out?: string;
  trace?: boolean;
  loopBudget_us?: number;
  bench?: boolean;
  /** Cache folder for git builds (no CLI flag needed; tests and callers may set it). */
  cache?: string;
  shard?: string;
  shardCount?: number;
  /** --tag (every one must match), --exclude-tag, --grep on scenario ids; added to the suite's tags. */
  tags?: string[];
  excludeTags?: string[];
  grep?: string;
  resume?: boolean;
  quiet?: boolean;
  cwd?: string;
}

export type ResolvedBuild =
  | { name: string; kind: 'spec'; spec: BuildSpec; text: string; origin: Origin }
  | { name: string; kind: 'git'; recipe: GitBuildRecipe; text: string; origin: Origin };

export interface ResolvedSettings {
  cwd: string;
  config: LoadedConfig | null;
  suite: Sourced<string> | null;
  /** Absolute scenario files and folders (globs expanded). */
  paths: Sourced<string[]> & { written: string[] };
  /** Which scenarios of those paths: the suite's tags and the flags together. */
  selection: ScenarioSelection;
  builds: ResolvedBuild[];
  buildsOrigin: Origin;
  baseline: Sourced<string | undefined>;
  policy: Sourced<{ file?: string; inline?: GatePolicy }>;
  jobs: Sourced<number | undefined>;
  out: Sourced<string>;
  trace: Sourced<boolean>;
  loopBudget_us: Sourced<number | undefined>;
  bench: Sourced<boolean>;
  cache: Sourced<string>;
}

/** Bad flags or a config that does not fit them; the message names the flag or file:line. */
export class SettingsError extends Error {
  constructor(readonly lines: string[]) {
    super(lines.join('\n'));
    this.name = 'SettingsError';
  }
}

const FLAG: Origin = { from: 'flag', flag: '' };
const DEFAULT: Origin = { from: 'default' };
const flag = (name: string): Origin => ({ ...FLAG, flag: name });

/** `file:line:col path` of a file origin, `--flag` of a flag origin, `default` otherwise. */
export function describeOrigin(origin: Origin): string {
  if (origin.from === 'flag') return `flag ${origin.flag}`;
  if (origin.from === 'default') return 'default';
  const at = origin.line === undefined ? origin.file : `${origin.file}:${origin.line}:${origin.col}`;
  return `file ${at} ${origin.path}`;
}

/** The issue-style prefix of an item: `footing.config.yaml:9:3: builds.main` or `--build main=…`. */
export function itemLabel(origin: Origin): string {
  if (origin.from === 'file') return `${origin.line === undefined ? origin.file : `${origin.file}:${origin.line}:${origin.col}`}: ${origin.path}`;
  if (origin.from === 'flag') return origin.flag;
  return '(default)';
}

export function resolveSettings(flags: RunFlags): ResolvedSettings {
  const cwd = flags.cwd ?? process.cwd();
  const configFile = findConfigFile(cwd, flags.config);
  if (flags.config !== undefined && configFile !== null && !existsSync(configFile)) {
    throw new SettingsError([`--config ${flags.config}: no such file (${configFile})`]);
  }
  const config = configFile === null ? null : loadConfig(configFile, cwd);
  const data = config?.data ?? {};
  const projectDir = config?.dir ?? cwd;
  const fromFile = (segments: (string | number)[]): Origin => {
    const pos = config!.where(segments);
    return { from: 'file', file: config!.display, path: segments.join('.'), line: pos.line, col: pos.col };
  };
  const problems: string[] = [];

  // Suite.
  let suite: Sourced<string> | null = null;
  let suiteData: SuiteData | undefined;
  if (flags.suite !== undefined) {
    if (config === null) {
      throw new SettingsError([`--suite ${flags.suite}: suites are defined in footing.config.yaml, and there is none in ${displayPath(cwd)} (give one with --config FILE; see docs/config.md)`]);
    }
    const suites = Object.keys(data.suites ?? {});
    suiteData = data.suites?.[flags.suite];
    if (suiteData === undefined) {
      throw new SettingsError([
        suites.length === 0
          ? `--suite ${flags.suite}: ${config.display} defines no suites (add suites: { ${flags.suite}: [scenarios] })`
          : `--suite ${flags.suite}: ${config.display} has no suite of that name${didYouMean(flags.suite, suites)}`,
      ]);
    }
    suite = { value: flags.suite, origin: flag('--suite') };
  }

  // Scenarios.
  let paths: ResolvedSettings['paths'];
  if (flags.paths !== undefined && flags.paths.length > 0) {
    paths = { value: flags.paths.map((p) => path.resolve(cwd, p)), written: flags.paths, origin: flag('paths') };
  } else if (suite !== null && suiteData !== undefined) {
    const listed = Array.isArray(suiteData) ? suiteData : suiteData.scenarios;
    const base: (string | number)[] = Array.isArray(suiteData) ? ['suites', suite.value] : ['suites', suite.value, 'scenarios'];
    const resolved: string[] = [];
    listed.forEach((entry, i) => {
      const label = itemLabel(fromFile([...base, i]));
      if (isGlob(entry)) {
        const found = expandGlob(entry, projectDir);
        if (found.length === 0) problems.push(`${label}: ${JSON.stringify(entry)} matches no file (relative to ${displayPath(projectDir, cwd)})`);
        resolved.push(...found);
      } else {
        const absolute = path.resolve(projectDir, entry);
        if (!existsSync(absolute)) problems.push(`${label}: ${JSON.stringify(entry)} does not exist (looked for ${displayPath(absolute, cwd)})`);
        resolved.push(absolute);
      }
    });
    paths = { value: [...new Set(resolved)], written: listed, origin: fromFile(base) };
  } else {
    paths = { value: DEFAULT_SCENARIO_PATHS.map((p) => path.resolve(projectDir, p)), written: [...DEFAULT_SCENARIO_PATHS], origin: DEFAULT };
  }

  // Builds.
  const builds: ResolvedBuild[] = [];
  let buildsOrigin: Origin;
  const cache = sourced(flags.cache, '--cache', data.cache, ['cache'], DEFAULT_CACHE_DIR);
  const cacheDir = path.resolve(cache.origin.from === 'flag' ? cwd : projectDir, cache.value);
  const gitRecipe = (name: string, build: Partial<GitBuildData>, origin: Origin): GitBuildRecipe | null => {
    const recipe = recipeOf(data, build);
    if (recipe.entry === undefined) {
      problems.push(`${itemLabel(origin)}: git:${build.ref} needs a recipe: set git: { build: …, entry: … } in ${config?.display ?? 'footing.config.yaml'} (see docs/config.md)`);
      return null;
    }
    return {
      name,
      repo: path.resolve(projectDir, recipe.repo ?? '.'),
      ref: recipe.ref,
      build: recipe.build,
      entry: recipe.entry,
      kind: recipe.kind,
      args: recipe.args,
      options: recipe.options,
      cacheDir,
    };
  };
  const addSpec = (name: string | null, text: string, base: string, origin: Origin) => {
    try {
      const spec = parseBuildSpec(name === null ? text : `${name}=${text}`, base);
      builds.push({ name: spec.name, kind: 'spec', spec, text, origin });
    } catch (error) {
      if (error instanceof BuildSpecError) problems.push(`${itemLabel(origin)}: ${error.problem}`);
      else throw error;
    }
  };
  const configBuild = (name: string) => {
    const entry = data.builds![name];
    const origin = fromFile(['builds', name]);
    if (typeof entry === 'string') {
      const ref = gitRefOfSpec(entry);
      if (ref !== null) {
        const recipe = gitRecipe(name, { ref }, origin);
        if (recipe) builds.push({ name, kind: 'git', recipe, text: entry, origin });
      } else addSpec(name, entry, projectDir, origin);
    } else {
      const recipe = gitRecipe(name, entry, origin);
      if (recipe) builds.push({ name, kind: 'git', recipe, text: `git:${entry.ref}`, origin });
    }
  };
  if (flags.builds !== undefined && flags.builds.length > 0) {
    buildsOrigin = flag('--build');
    for (const text of flags.builds) {
      const origin = flag(`--build ${text}`);
      const eq = text.indexOf('=');
      const ref = eq > 0 ? gitRefOfSpec(text.slice(eq + 1)) : null;
      if (ref !== null) {
        const name = text.slice(0, eq);
        const recipe = gitRecipe(name, { ref }, origin);
        if (recipe) builds.push({ name, kind: 'git', recipe, text: text.slice(eq + 1), origin });
      } else if (eq < 0 && !text.trim().startsWith('ref:') && data.builds?.[text.trim()] !== undefined) {
        // A bare name picks a build of the config file.
        configBuild(text.trim());
      } else addSpec(null, text, cwd, origin);
    }
  } else if (suiteData !== undefined && !Array.isArray(suiteData) && suiteData.builds !== undefined) {
    buildsOrigin = fromFile(['suites', suite!.value, 'builds']);
    for (const name of suiteData.builds) configBuild(name);
  } else if (data.builds !== undefined && Object.keys(data.builds).length > 0) {
    buildsOrigin = fromFile(['builds']);
    for (const name of Object.keys(data.builds)) configBuild(name);
  } else {
    buildsOrigin = DEFAULT;
    for (const text of DEFAULT_BUILDS) addSpec(null, text, cwd, DEFAULT);
  }
  const seen = new Set<string>();
  for (const b of builds) {
    if (seen.has(b.name)) problems.push(`${itemLabel(b.origin)}: the build name "${b.name}" is used twice`);
    seen.add(b.name);
  }

  // Baseline: the flag, the suite's, the file's.
  let baseline: Sourced<string | undefined>;
  if (flags.baseline !== undefined) baseline = { value: flags.baseline, origin: flag('--baseline') };
  else if (suiteData !== undefined && !Array.isArray(suiteData) && suiteData.baseline !== undefined) {
    baseline = { value: suiteData.baseline, origin: fromFile(['suites', suite!.value, 'baseline']) };
  } else if (data.baseline !== undefined) baseline = { value: data.baseline, origin: fromFile(['baseline']) };
  else baseline = { value: undefined, origin: DEFAULT };
  // A shard holds only part of the pairs, so a baseline's partner run may be on another machine:
  // the file's baseline is applied after `footing merge` (ci/merge-shards.sh), not per shard.
  if (flags.shard !== undefined && baseline.origin.from === 'file') baseline = { value: undefined, origin: DEFAULT };
  if (baseline.value !== undefined && builds.length > 0 && !seen.has(baseline.value)) {
    const names = [...seen];
    problems.push(`${itemLabel(baseline.origin)}: baseline "${baseline.value}" is not one of the builds (${names.join(', ')})${didYouMean(baseline.value, names).replace(/; known: .*/, '')}`);
  }

  // Gate policy.
  let policy: ResolvedSettings['policy'];
  if (flags.policy !== undefined) policy = { value: { file: path.resolve(cwd, flags.policy) }, origin: flag('--policy') };
  else if (typeof data.gate === 'string') policy = { value: { file: path.resolve(projectDir, data.gate) }, origin: fromFile(['gate']) };
  else if (config?.inlinePolicy) policy = { value: { inline: config.inlinePolicy }, origin: fromFile(['gate']) };
  else policy = { value: {}, origin: DEFAULT };

  const out = sourced(flags.out, '--out', data.out, ['out'], DEFAULT_OUT_DIR);
  const outDir = path.resolve(out.origin.from === 'file' ? projectDir : cwd, out.value);

  if (problems.length > 0) throw new SettingsError(problems);
  const suiteMapping = suiteData !== undefined && !Array.isArray(suiteData) ? suiteData : undefined;
  return {
    cwd,
    config,
    suite,
    paths,
    selection: {
      tags: [...(suiteMapping?.tags ?? []), ...(flags.tags ?? [])],
      excludeTags: [...(suiteMapping?.excludeTags ?? []), ...(flags.excludeTags ?? [])],
      grep: flags.grep,
    },
    builds,
    buildsOrigin,
    baseline,
    policy,
    jobs: sourced(flags.jobs, '--jobs', data.jobs, ['jobs'], undefined),
    out: { value: outDir, origin: out.origin },
    trace: sourced(flags.trace, '--trace', data.trace, ['trace'], false),
    loopBudget_us: sourced(flags.loopBudget_us, '--loop-budget', data.loopBudget_us, ['loopBudget_us'], undefined),
    bench: sourced(flags.bench, '--bench', data.bench, ['bench'], false),
    cache: { value: cacheDir, origin: cache.origin },
  };

  function sourced<T>(flagValue: T | undefined, flagName: string, fileValue: T | undefined, segments: string[], fallback: T): Sourced<T> {
    if (flagValue !== undefined) return { value: flagValue, origin: flag(flagName) };
    if (fileValue !== undefined) return { value: fileValue, origin: fromFile(segments) };
    return { value: fallback, origin: DEFAULT };
  }
}

/** Settings errors and config errors as printable lines (or null for anything else). */
export function settingsErrorLines(error: unknown): string[] | null {
  if (error instanceof SettingsError) return error.lines;
  if (error instanceof ConfigError) return error.issues.map((issue: FileIssue) => formatPolicyIssue(issue));
  return null;
}
