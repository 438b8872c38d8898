// Where a build came from, recorded beside its results: the spec, and the git commit and
// dirtiness of the checkout its entry lives in. git is run with argument arrays, never a shell.

import { execFile } from 'node:child_process';
import { existsSync, statSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { BuildKind, BuildOptionValue, BuildSpec } from './spec.js';

export interface GitProvenance {
  /** Top directory of the checkout. */
  root: string;
  /** `git rev-parse HEAD`. */
  commit: string;
  /** `git status --porcelain` listed anything (modified, staged or untracked files). */
  dirty: boolean;
}

export interface BuildManifest {
  name: string;
  kind: BuildKind;
  entry: string;
  args: string[];
  options: Record<string, BuildOptionValue>;
  /** The file whose checkout was examined; null when none could be found. */
  source: string | null;
  /** null when the source is not inside a git checkout (or git is not installed). */
  git: GitProvenance | null;
}

/** This file's own checkout: where the reference builds live. */
const FOOTING_DIRECTORY = fileURLToPath(new URL('../../harness/builds/', import.meta.url)).replace(/\/$/, '');

const GIT_TIMEOUT_ms = 10_000;

export async function buildManifest(spec: BuildSpec): Promise<BuildManifest> {
  const source = provenanceSource(spec);
  return {
    name: spec.name,
    kind: spec.kind,
    entry: spec.entry,
    args: [...spec.args],
    options: { ...spec.options },
    source,
    git: source === null ? null : await gitProvenance(existsSync(source) && statSync(source).isDirectory() ? source : dirname(source)),
  };
}

/**
 * The file that says which code runs: the module, the program, or — for `exec:python3 x.py` style
 * specs where the program is a command on PATH — the first argument naming an existing file.
 */
export function provenanceSource(spec: BuildSpec): string | null {
  if (spec.kind === 'reference') return FOOTING_DIRECTORY;
  if (spec.kind === 'module') return spec.entry;
  if (spec.entry.includes('/')) return spec.entry;
  for (const arg of spec.args) {
    if (arg.startsWith('-')) continue;
    const candidate = resolve(spec.cwd, arg);
    if (existsSync(candidate)) return candidate;
  }
  return null;
}

/** Commit and dirtiness of the checkout containing `directory`, or null when there is none. */
export async function gitProvenance(directory: string): Promise<GitProvenance | null> {
  if (!existsSync(directory)) return null;
  const root = await git(directory, ['rev-parse', '--show-toplevel']);
  if (root === null) return null;
  const commit = await git(directory, ['rev-parse', 'HEAD']);
  // A fresh repository without commits has no HEAD: nothing to record.
  if (commit === null) return null;
  const status = await git(directory, ['status', '--porcelain']);
  // A status git could not produce is reported dirty: better a needless warning than a false "clean".
  return { root: root.trim(), commit: commit.trim(), dirty: status === null || status.trim() !== '' };
}

function git(cwd: string, args: string[]): Promise<string | null> {
  // GIT_DIR and friends (set when running inside a git hook) would point git at another repository.
  const env: NodeJS.ProcessEnv = { ...process.env };
  for (const key of ['GIT_DIR', 'GIT_WORK_TREE', 'GIT_INDEX_FILE', 'GIT_PREFIX']) delete env[key];
  return new Promise((settle) => {
    execFile('git', args, { cwd, env, timeout: GIT_TIMEOUT_ms, windowsHide: true }, (error, stdout) => {
      settle(error ? null : stdout);
    });
  });
}
