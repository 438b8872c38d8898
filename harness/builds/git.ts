// Builds taken straight from a git ref of the controller repository: a detached worktree of the
// ref's commit in a cache folder, the recipe's build command run inside it, and the entry (a module
// or a program) opened from there. Cached by commit id and build command, so a nightly run of five
// builds rebuilds only the refs that moved.
//
// Safety: git is run with argument arrays, never a shell. The ref is refused unless
// `git check-ref-format --allow-onelevel` accepts it (no leading '-', no `..`, `~`, `^`, `:`,
// spaces…), and is resolved with `rev-parse --verify --end-of-options REF^{commit}`. The build
// command is the config author's own shell text, run as `sh -c COMMAND` in the worktree; nothing
// from the ref (or the resolved commit) is put into that text or its environment.

import { spawn, execFile } from 'node:child_process';
import { createHash } from 'node:crypto';
import { waitForLock } from '../files/lock.js';
import { existsSync, mkdirSync, readdirSync, readFileSync, renameSync, rmSync, statSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import type { BuildOptionValue, BuildSpec } from './spec.js';

/** Default cache folder, relative to the project (the folder of footing.config.yaml). */
export const DEFAULT_CACHE_DIR = '.footing-cache';
/** Sub-folder of the cache holding one worktree per (commit, build command). */
export const GIT_CACHE_SUBDIR = 'git';
/** Lines of build output kept for the error of a failed build (the end is where compilers say why). */
export const OUTPUT_TAIL_LINES = 40;
const OUTPUT_TAIL_BYTES = 8192;
const GIT_TIMEOUT_ms = 60_000;
/** A build command that runs longer than this is stopped and counts as failed (common practice: CI steps cap at tens of minutes). */
export const DEFAULT_BUILD_TIMEOUT_s = 1800;

export interface GitBuildRecipe {
  /** Build name (the key in results). */
  name: string;
  /** The controller repository (any folder inside its checkout), absolute. */
  repo: string;
  /** Branch, tag, remote branch or full commit id; must be a valid ref name. */
  ref: string;
  /** Shell command run in the worktree (`sh -c`); omitted: nothing to build. */
  build?: string;
  /** Module file (kind module) or program (kind process), relative to the worktree. */
  entry: string;
  kind: 'module' | 'process';
  /** Program arguments (process builds). Relative file arguments stay relative: the program runs in the worktree. */
  args?: string[];
  options?: Record<string, BuildOptionValue>;
  /** Cache folder, absolute. */
  cacheDir: string;
  buildTimeout_s?: number;
}

export interface GitBuildOrigin {
  repo: string;
  ref: string;
  commit: string;
  build: string | null;
  worktree: string;
  /** The worktree was already built by an earlier run. */
  cached: boolean;
}

export type GitBuildOutcome =
  | { ok: true; spec: BuildSpec; origin: GitBuildOrigin; manifest: Record<string, unknown> }
  | { ok: false; origin: Partial<GitBuildOrigin>; message: string; outputTail: string };

/** A ref that is malformed or names no commit, or a repository that is not one: bad input, nothing is run. */
export class GitRefError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'GitRefError';
  }
}

interface Marker {
  repo: string;
  ref: string;
  commit: string;
  build: string | null;
  builtAt: string;
}

/**
 * Resolves the recipe's ref to a commit (throws GitRefError when it cannot), then returns the
 * built worktree's BuildSpec — from the cache when this commit was built with this command before.
 * A failing build command or a missing entry is not thrown: it comes back as `ok: false` with the
 * command's output tail, so the suite can record error runs for this build and go on.
 */
export async function prepareGitBuild(recipe: GitBuildRecipe): Promise<GitBuildOutcome> {
  const repoRoot = await repositoryRoot(recipe.repo);
  const commit = await resolveCommit(repoRoot, recipe.ref);
  const key = cacheKey(commit, recipe.build);
  const gitCache = path.join(recipe.cacheDir, GIT_CACHE_SUBDIR);
  const worktree = path.join(gitCache, key);
  const markerFile = `${worktree}.json`;
  const entry = path.resolve(worktree, recipe.entry);
  const origin: GitBuildOrigin = { repo: repoRoot, ref: recipe.ref, commit, build: recipe.build ?? null, worktree, cached: false };
  // One preparer per (commit, command): a second run sharing the cache waits, then finds it built.
  mkdirSync(gitCache, { recursive: true });
  const lock = await waitForLock(`${worktree}.lock`, `building ${commit.slice(0, 12)}`, ((recipe.buildTimeout_s ?? DEFAULT_BUILD_TIMEOUT_s) + 120) * 1000);
  if (lock === null) return { ok: false, origin, message: `another footing process kept ${worktree}.lock longer than the build timeout allows`, outputTail: '' };
  try {
    return await prepareLocked(recipe, origin, { gitCache, worktree, markerFile, entry, repoRoot, commit });
  } finally {
    lock.release();
  }
}

async function prepareLocked(
  recipe: GitBuildRecipe,
  origin: GitBuildOrigin,
  { gitCache, worktree, markerFile, entry, repoRoot, commit }: { gitCache: string; worktree: string; markerFile: string; entry: string; repoRoot: string; commit: string },
): Promise<GitBuildOutcome> {
  if (existsSync(markerFile) && existsSync(worktree) && existsSync(entry)) {
    origin.cached = true;
    return success(recipe, origin, entry);
  }
  mkdirSync(gitCache, { recursive: true });
  // A worktree without its marker is what an interrupted or failed earlier build left: start over.
  rmSync(markerFile, { force: true });
  await removeWorktree(repoRoot, worktree);
  const added = await git(repoRoot, ['worktree', 'add', '--detach', '--force', worktree, commit]);
  if (added.code !== 0) {
    return { ok: false, origin, message: `git worktree add of commit ${commit} (ref ${recipe.ref}) failed`, outputTail: tail(added.output) };
  }

  if (recipe.build !== undefined && recipe.build.trim() !== '') {
    const run = await runBuildCommand(recipe.build, worktree, (recipe.buildTimeout_s ?? DEFAULT_BUILD_TIMEOUT_s) * 1000);
    if (run.code !== 0) {
      const why = run.timedOut ? `was stopped after ${recipe.buildTimeout_s ?? DEFAULT_BUILD_TIMEOUT_s} s` : run.signal ? `was killed by ${run.signal}` : `exited with status ${run.code}`;
      return {
        ok: false,
        origin,
        message: `build command \`${recipe.build}\` ${why} in the worktree of ref ${recipe.ref} (commit ${commit.slice(0, 12)})`,
        outputTail: tail(run.output),
      };
    }
  }
  if (!existsSync(entry)) {
    return {
      ok: false,
      origin,
      message: `entry ${recipe.entry} does not exist in the worktree of ref ${recipe.ref} (commit ${commit.slice(0, 12)}) after the build${recipe.build ? ` command \`${recipe.build}\`` : ' (no build command given)'}; the worktree's top level holds: ${listTop(worktree)}`,
      outputTail: '',
    };
  }
  const marker: Marker = { repo: repoRoot, ref: recipe.ref, commit, build: recipe.build ?? null, builtAt: new Date().toISOString() };
  const temp = `${markerFile}.${process.pid}.tmp`;
  writeFileSync(temp, `${JSON.stringify(marker, null, 2)}\n`);
  renameSync(temp, markerFile);
  return success(recipe, origin, entry);
}

function success(recipe: GitBuildRecipe, origin: GitBuildOrigin, entry: string): GitBuildOutcome {
  const spec: BuildSpec = {
    name: recipe.name,
    kind: recipe.kind,
    entry,
    args: [...(recipe.args ?? [])],
    options: { ...(recipe.options ?? {}) },
    cwd: origin.worktree,
    text: `${recipe.name}=git:${recipe.ref}`,
  };
  // The source is exactly the commit; files the build wrote are its products, not local edits.
  const manifest = {
    name: spec.name,
    kind: spec.kind,
    entry: spec.entry,
    args: spec.args,
    options: spec.options,
    source: origin.worktree,
    git: { root: origin.worktree, commit: origin.commit, dirty: false },
    commit: origin.commit,
    dirty: false,
    origin: { repo: origin.repo, ref: origin.ref, commit: origin.commit, build: origin.build, cached: origin.cached },
  };
  return { ok: true, spec, origin, manifest };
}

/** Cache folder name: the commit, and a short digest of the build command (another command, another build). */
export function cacheKey(commit: string, build: string | undefined): string {
  const digest = createHash('sha256').update(build ?? '').digest('hex').slice(0, 10);
  return `${commit}-${digest}`;
}

/** Throws GitRefError unless `ref` is a well-formed ref name (branch, tag, remote branch, commit id). */
export async function checkRefName(ref: string): Promise<void> {
  if (ref === '' || ref.startsWith('-') || /[\0\n]/.test(ref)) {
    throw new GitRefError(`"${ref}" is not a valid git ref name (expected a branch, tag, remote branch or commit id such as main, v1.2, origin/main)`);
  }
  const checked = await git(process.cwd(), ['check-ref-format', '--allow-onelevel', ref]);
  if (checked.code !== 0) {
    throw new GitRefError(`"${ref}" is not a valid git ref name (git check-ref-format refuses it; expected a branch, tag, remote branch or commit id such as main, v1.2, origin/main — revision expressions like main~1 are not accepted)`);
  }
}

/** Resolves `ref` in the repository containing `repo` (any folder of the checkout); GitRefError when it cannot. */
export async function resolveRef(repo: string, ref: string): Promise<{ repoRoot: string; commit: string }> {
  const repoRoot = await repositoryRoot(repo);
  return { repoRoot, commit: await resolveCommit(repoRoot, ref) };
}

async function repositoryRoot(repo: string): Promise<string> {
  if (!existsSync(repo)) throw new GitRefError(`repository folder ${repo} does not exist`);
  const top = await git(repo, ['rev-parse', '--show-toplevel']);
  if (top.code !== 0) throw new GitRefError(`${repo} is not inside a git repository (git: ${firstLine(top.output)})`);
  return top.output.trim();
}

/** The commit id `ref` names in the repository; GitRefError naming nearby refs when there is none. */
export async function resolveCommit(repoRoot: string, ref: string): Promise<string> {
  await checkRefName(ref);
  const resolved = await git(repoRoot, ['rev-parse', '--verify', '--quiet', '--end-of-options', `${ref}^{commit}`]);
  const commit = resolved.output.trim();
  if (resolved.code !== 0 || !/^[0-9a-f]{40,64}$/.test(commit)) {
    const refs = await git(repoRoot, ['for-each-ref', '--format=%(refname:short)', 'refs/heads', 'refs/tags', 'refs/remotes']);
    const known = refs.code === 0 ? refs.output.split('\n').map((s) => s.trim()).filter(Boolean) : [];
    const listed = known.length === 0 ? '' : ` (it has ${known.slice(0, 12).join(', ')}${known.length > 12 ? ', …' : ''})`;
    throw new GitRefError(`ref "${ref}" names no commit in ${repoRoot}${listed}; in CI, fetch it first (git fetch origin ${ref.replace(/^origin\//, '')})`);
  }
  return commit;
}

async function removeWorktree(repoRoot: string, worktree: string): Promise<void> {
  if (existsSync(worktree)) {
    const removed = await git(repoRoot, ['worktree', 'remove', '--force', '--force', worktree]);
    if (removed.code !== 0) rmSync(worktree, { recursive: true, force: true });
  }
  await git(repoRoot, ['worktree', 'prune']);
}

export interface ClearCacheOutcome {
  removed: number;
  lines: string[];
}

/** Removes every cached git build under `cacheDir` and unregisters their worktrees. */
export async function clearGitCache(cacheDir: string): Promise<ClearCacheOutcome> {
  const gitCache = path.join(cacheDir, GIT_CACHE_SUBDIR);
  if (!existsSync(gitCache)) return { removed: 0, lines: [`nothing cached in ${cacheDir}`] };
  const repos = new Set<string>();
  let removed = 0;
  for (const name of readdirSync(gitCache)) {
    const full = path.join(gitCache, name);
    if (name.endsWith('.json')) {
      try {
        repos.add((JSON.parse(readFileSync(full, 'utf8')) as Marker).repo);
      } catch {
        // An unreadable marker is removed with the rest.
      }
      continue;
    }
    if (statSync(full).isDirectory()) {
      removed++;
      // The worktree's .git file names the repository that registered it.
      const dotGit = path.join(full, '.git');
      const pointer = existsSync(dotGit) && statSync(dotGit).isFile() ? /^gitdir:\s*(.+)$/m.exec(readFileSync(dotGit, 'utf8')) : null;
      if (pointer) repos.add(path.resolve(pointer[1].trim(), '..', '..', '..'));
    }
  }
  rmSync(gitCache, { recursive: true, force: true });
  for (const repo of repos) if (existsSync(repo)) await git(repo, ['worktree', 'prune']);
  return { removed, lines: [`removed ${removed} cached git build${removed === 1 ? '' : 's'} from ${cacheDir}`] };
}

interface CommandOutcome {
  code: number;
  signal: NodeJS.Signals | null;
  output: string;
  timedOut: boolean;
}

function cleanGitEnvironment(): NodeJS.ProcessEnv {
  // GIT_DIR and friends (set inside git hooks) would point git, and the build, at another repository.
  const env: NodeJS.ProcessEnv = { ...process.env };
  for (const key of ['GIT_DIR', 'GIT_WORK_TREE', 'GIT_INDEX_FILE', 'GIT_PREFIX', 'GIT_COMMON_DIR']) delete env[key];
  return env;
}

/** git with an argument array (never a shell) and a clean environment; exit code and output, never throws. */
export function git(cwd: string, args: string[]): Promise<{ code: number; output: string }> {
  return new Promise((settle) => {
    execFile('git', args, { cwd, env: cleanGitEnvironment(), timeout: GIT_TIMEOUT_ms, windowsHide: true, maxBuffer: 16 * 1024 * 1024 }, (error, stdout, stderr) => {
      const code = error ? (typeof (error as { code?: unknown }).code === 'number' ? ((error as { code: number }).code) : 1) : 0;
      settle({ code, output: code === 0 ? stdout : `${stderr}${stdout}` });
    });
  });
}

function runBuildCommand(command: string, cwd: string, timeout_ms: number): Promise<CommandOutcome> {
  return new Promise((settle) => {
    const child = spawn('sh', ['-c', command], { cwd, env: cleanGitEnvironment(), stdio: ['ignore', 'pipe', 'pipe'], detached: true });
    let output = '';
    const keep = (chunk: Buffer) => {
      output += chunk.toString('utf8');
      if (output.length > 4 * OUTPUT_TAIL_BYTES) output = output.slice(-2 * OUTPUT_TAIL_BYTES);
    };
    child.stdout.on('data', keep);
    child.stderr.on('data', keep);
    let timedOut = false;
    const timer = setTimeout(() => {
      timedOut = true;
      // The command's own children (compilers, make jobs) share its process group.
      try {
        process.kill(-(child.pid as number), 'SIGKILL');
      } catch {
        child.kill('SIGKILL');
      }
    }, timeout_ms);
    child.on('error', (error) => {
      clearTimeout(timer);
      settle({ code: 127, signal: null, output: `${output}${error.message}\n`, timedOut });
    });
    child.on('close', (code, signal) => {
      clearTimeout(timer);
      settle({ code: code ?? 128, signal, output, timedOut });
    });
  });
}

/** The last OUTPUT_TAIL_LINES lines (at most OUTPUT_TAIL_BYTES characters) of a command's output. */
export function tail(output: string): string {
  const lines = output.replace(/\s+$/, '').split('\n');
  const kept = lines.slice(-OUTPUT_TAIL_LINES).join('\n');
  return kept.length > OUTPUT_TAIL_BYTES ? kept.slice(-OUTPUT_TAIL_BYTES) : kept;
}

function listTop(folder: string): string {
  try {
    const names = readdirSync(folder).filter((n) => n !== '.git').sort();
    return names.length === 0 ? '(nothing)' : names.slice(0, 20).join(', ') + (names.length > 20 ? ', …' : '');
  } catch {
    return '(unreadable)';
  }
}

function firstLine(text: string): string {
  return text.trim().split('\n')[0] ?? '';
}
