// A temporary controller repository for the git-build and CI-script tests: the small standing
// controller of fixtures/controller at two versions — `main` (TRUST 1.0) and `feature`
// (TRUST 1.6, the margin-losing one) — plus `tidy` (main with a comment changed, same behaviour),
// the bundled test scenarios, and a footing.config.yaml. git runs with argument arrays only.

import { execFileSync } from 'node:child_process';
import { cpSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

export const FIXTURE = fileURLToPath(new URL('./fixtures/controller/', import.meta.url));
export const FOOTING_ROOT = fileURLToPath(new URL('../../../', import.meta.url));
/** How the CI scripts are told to call Footing in tests (in a controller repo: npx footing). */
export const FOOTING_COMMAND = `node ${path.join(FOOTING_ROOT, 'bin', 'footing.js')}`;

/** The build recipe every test config uses: a real (if tiny) build step writing dist/. */
export const BUILD_COMMAND = 'mkdir -p dist && cp src/controller.mjs dist/controller.mjs';

export const CONFIG_TEXT = `# footing.config.yaml of the test controller repository (invented)
version: 1
suites:
  nightly: [scenarios]
  merge:
    scenarios: ["scenarios/stand-*.yaml"]
    builds: [main, candidate]
    baseline: main
git:
  build: ${BUILD_COMMAND}
  entry: dist/controller.mjs
builds:
  main: git:main
  candidate: git:HEAD
jobs: 2
out: out/footing
`;

export function git(cwd: string, ...args: string[]): string {
  return execFileSync('git', args, {
    cwd,
    encoding: 'utf8',
    env: { ...process.env, GIT_AUTHOR_NAME: 'Test', GIT_AUTHOR_EMAIL: 'test@example.invalid', GIT_COMMITTER_NAME: 'Test', GIT_COMMITTER_EMAIL: 'test@example.invalid' },
  });
}

export interface ControllerRepo {
  dir: string;
  commits: { main: string; feature: string; tidy: string };
}

/**
 * Creates the repository with `main`, `feature` and `tidy`, leaving `checkout` checked out.
 * `config` replaces the config text (null: no config file committed).
 */
export function createControllerRepo(options: { checkout?: 'main' | 'feature' | 'tidy'; config?: string | null } = {}): ControllerRepo {
  const dir = mkdtempSync(path.join(tmpdir(), 'footing-ctrl-'));
  git(dir, 'init', '--quiet', '--initial-branch=main');
  cpSync(FIXTURE, dir, { recursive: true });
  writeFileSync(path.join(dir, '.gitignore'), '.footing-cache/\nout/\ndist/\n');
  const config = options.config === undefined ? CONFIG_TEXT : options.config;
  if (config !== null) writeFileSync(path.join(dir, 'footing.config.yaml'), config);
  git(dir, 'add', '-A');
  git(dir, 'commit', '--quiet', '-m', 'controller v1');
  const main = git(dir, 'rev-parse', 'HEAD').trim();

  const controller = path.join(dir, 'src', 'controller.mjs');
  const original = readFileSync(controller, 'utf8');
  git(dir, 'checkout', '--quiet', '-b', 'feature');
  writeFileSync(controller, original.replace('const TRUST = 1.0;', 'const TRUST = 1.6;'));
  git(dir, 'commit', '--quiet', '-am', 'trust the friction estimate more');
  const feature = git(dir, 'rev-parse', 'HEAD').trim();

  git(dir, 'checkout', '--quiet', '-b', 'tidy', 'main');
  writeFileSync(controller, original.replace('// A small invented standing controller', '// A small, invented standing controller'));
  git(dir, 'commit', '--quiet', '-am', 'tidy a comment');
  const tidy = git(dir, 'rev-parse', 'HEAD').trim();

  git(dir, 'checkout', '--quiet', options.checkout ?? 'feature');
  return { dir, commits: { main, feature, tidy } };
}
