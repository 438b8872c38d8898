import { existsSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { cacheKey, checkRefName, clearGitCache, GitRefError, prepareGitBuild, resolveRef, type GitBuildRecipe } from '../../../harness/builds/git.js';
import { clearCache } from '../../../harness/commands/cache.js';
import { runConfiguredSuite } from '../../../harness/commands/run.js';
import { validateResults } from '../../../harness/results/validate.js';
import type { ResultsFile } from '../../../harness/results/types.js';
import { EXIT } from '../../../harness/commands/exit.js';
import { BUILD_COMMAND, CONFIG_TEXT, createControllerRepo, git } from './repo.js';

function recipe(dir: string, ref: string, extra: Partial<GitBuildRecipe> = {}): GitBuildRecipe {
  return { name: 'b', repo: dir, ref, build: BUILD_COMMAND, entry: 'dist/controller.mjs', kind: 'module', cacheDir: path.join(dir, '.footing-cache'), ...extra };
}

const worktrees = (dir: string) => git(dir, 'worktree', 'list', '--porcelain').split('\n').filter((l) => l.startsWith('worktree ')).length;

describe('git-ref builds: refs', () => {
  it('refuses ref names git would refuse, without running anything', async () => {
    for (const bad of ['main..feature', 'main~1', 'a b', '-rf', 'x:y', '']) {
      await expect(checkRefName(bad), bad).rejects.toThrow(GitRefError);
    }
    await expect(checkRefName('origin/main')).resolves.toBeUndefined();
  });

  it('resolves a branch to its commit and names the known refs when one is missing', async () => {
    const repo = createControllerRepo();
    await expect(resolveRef(repo.dir, 'main')).resolves.toMatchObject({ commit: repo.commits.main });
    await expect(resolveRef(repo.dir, 'mainn')).rejects.toThrow(/ref "mainn" names no commit in .*\(it has feature, main, tidy\)/);
  });

  it('never hands the ref to a shell: a branch named with shell syntax builds, and the syntax stays inert', async () => {
    const repo = createControllerRepo();
    // `;`, `$(…)` and `${IFS}` are legal in git ref names; through a shell this would run touch.
    const legal = 'x;touch${IFS}pwned;$(touch${IFS}pwned2)';
    await expect(checkRefName(legal)).resolves.toBeUndefined();
    git(repo.dir, 'branch', legal, 'main');
    const outcome = await prepareGitBuild(recipe(repo.dir, legal));
    expect(outcome.ok).toBe(true);
    if (!outcome.ok) return;
    expect(outcome.origin.commit).toBe(repo.commits.main);
    for (const folder of [repo.dir, outcome.origin.worktree, process.cwd()]) {
      expect(existsSync(path.join(folder, 'pwned')) || existsSync(path.join(folder, 'pwned2'))).toBe(false);
    }
  });
});

describe('git-ref builds: worktree, build, cache', () => {
  it('builds the commit of the ref in a worktree of the cache, and reuses it while the commit is unchanged', async () => {
    const repo = createControllerRepo();
    const first = await prepareGitBuild(recipe(repo.dir, 'feature'));
    expect(first.ok).toBe(true);
    if (!first.ok) return;
    expect(first.origin).toMatchObject({ commit: repo.commits.feature, cached: false, ref: 'feature' });
    expect(first.origin.worktree).toBe(path.join(repo.dir, '.footing-cache', 'git', cacheKey(repo.commits.feature, BUILD_COMMAND)));
    // The built file is the feature version (TRUST 1.6), loaded from the worktree, not the checkout.
    expect(readFileSync(first.spec.entry, 'utf8')).toContain('const TRUST = 1.6;');
    expect(first.manifest).toMatchObject({ commit: repo.commits.feature, dirty: false, origin: { ref: 'feature', cached: false } });

    const second = await prepareGitBuild(recipe(repo.dir, 'feature', { name: 'again' }));
    expect(second.ok && second.origin.cached).toBe(true);
    // Another ref at the same commit is the same build.
    git(repo.dir, 'tag', 'v2', 'feature');
    const tagged = await prepareGitBuild(recipe(repo.dir, 'v2'));
    expect(tagged.ok && tagged.origin.cached).toBe(true);
    // Another build command is another build of the same commit.
    const other = await prepareGitBuild(recipe(repo.dir, 'feature', { build: `${BUILD_COMMAND} && true` }));
    expect(other.ok && other.origin.cached).toBe(false);
  });

  it('two preparations of one commit at once build it once: the second waits for the lock and finds it cached', async () => {
    const repo = createControllerRepo();
    const counted = `${BUILD_COMMAND} && sleep 0.5 && echo built >> ../../built.log`;
    const [a, b] = await Promise.all([prepareGitBuild(recipe(repo.dir, 'feature', { build: counted })), prepareGitBuild(recipe(repo.dir, 'feature', { build: counted, name: 'other' }))]);
    expect(a.ok && b.ok).toBe(true);
    expect([a.ok && a.origin.cached, b.ok && b.origin.cached].sort()).toEqual([false, true]);
    expect(readFileSync(path.join(repo.dir, '.footing-cache', 'built.log'), 'utf8')).toBe('built\n');
  });

  it('rebuilds after the ref moves to a new commit', async () => {
    const repo = createControllerRepo();
    const before = await prepareGitBuild(recipe(repo.dir, 'tidy'));
    git(repo.dir, 'checkout', '--quiet', 'tidy');
    writeFileSync(path.join(repo.dir, 'NOTES'), 'moved\n');
    git(repo.dir, 'add', 'NOTES');
    git(repo.dir, 'commit', '--quiet', '-m', 'move tidy');
    const after = await prepareGitBuild(recipe(repo.dir, 'tidy'));
    expect(before.ok && after.ok).toBe(true);
    if (before.ok && after.ok) {
      expect(after.origin.commit).not.toBe(before.origin.commit);
      expect(after.origin.cached).toBe(false);
    }
  });

  it('returns a failed build command with its output tail instead of throwing', async () => {
    const repo = createControllerRepo();
    const outcome = await prepareGitBuild(recipe(repo.dir, 'main', { build: 'echo compiling; echo "error: gains.h:3: missing ;" >&2; exit 7' }));
    expect(outcome.ok).toBe(false);
    if (outcome.ok) return;
    expect(outcome.message).toMatch(/^build command `.*` exited with status 7 in the worktree of ref main \(commit [0-9a-f]{12}\)$/);
    expect(outcome.outputTail).toContain('error: gains.h:3: missing ;');
    // Not marked as built: the next run tries again.
    const retry = await prepareGitBuild(recipe(repo.dir, 'main', { build: 'echo compiling; echo "error: gains.h:3: missing ;" >&2; exit 7' }));
    expect(retry.ok).toBe(false);
  });

  it('says which entry is missing after the build and what the worktree holds', async () => {
    const repo = createControllerRepo();
    const outcome = await prepareGitBuild(recipe(repo.dir, 'main', { entry: 'dist/controler.mjs' }));
    expect(outcome.ok).toBe(false);
    if (!outcome.ok) expect(outcome.message).toMatch(/^entry dist\/controler\.mjs does not exist in the worktree of ref main .* after the build command .*; the worktree's top level holds: .*dist.*src/);
  });

  it('clears the cache and unregisters the worktrees', async () => {
    const repo = createControllerRepo();
    await prepareGitBuild(recipe(repo.dir, 'main'));
    await prepareGitBuild(recipe(repo.dir, 'feature'));
    expect(worktrees(repo.dir)).toBe(3);
    const cleared = await clearGitCache(path.join(repo.dir, '.footing-cache'));
    expect(cleared.removed).toBe(2);
    expect(existsSync(path.join(repo.dir, '.footing-cache', 'git'))).toBe(false);
    expect(worktrees(repo.dir)).toBe(1);
    // Through the command, relative to the config file, nothing is left to clear.
    const again = await clearCache({ cwd: repo.dir });
    expect(again).toEqual({ exitCode: EXIT.pass, lines: ['nothing cached in .footing-cache'] });
  });
});

describe('footing run with git builds from the config (functions, no CLI)', () => {
  const quick = { runTimeout: { base_s: 60, perSimulatedSecond: 30 } };

  it('names the config file and item for a ref that does not exist, and runs nothing', async () => {
    const repo = createControllerRepo({ config: CONFIG_TEXT.replace('candidate: git:HEAD', 'candidate: git:featur') });
    const outcome = await runConfiguredSuite({ suite: 'merge', cwd: repo.dir, quiet: true }, quick);
    expect(outcome.exitCode).toBe(EXIT.badInput);
    expect(outcome.lines[0]).toMatch(/^footing\.config\.yaml:14:14: builds\.candidate: ref "featur" names no commit in .* \(it has feature, main, tidy\)/);
    expect(existsSync(path.join(repo.dir, 'out'))).toBe(false);
  });

  it('names the flag for a malformed ref given on the command line', async () => {
    const repo = createControllerRepo();
    const outcome = await runConfiguredSuite({ suite: 'merge', builds: ['main', 'candidate=git:feature~1'], cwd: repo.dir, quiet: true }, quick);
    expect(outcome.exitCode).toBe(EXIT.badInput);
    expect(outcome.lines[0]).toMatch(/^--build candidate=git:feature~1: "feature~1" is not a valid git ref name/);
  });

  it('turns a failing build command into error runs of that build with the output tail; the other build still runs', async () => {
    const config = CONFIG_TEXT.replace('  candidate: git:HEAD', '  candidate:\n    ref: feature\n    build: \'echo "cc: fatal: no input files" >&2; exit 3\'');
    const repo = createControllerRepo({ config });
    const outcome = await runConfiguredSuite({ suite: 'merge', cwd: repo.dir, quiet: true }, quick);
    expect(outcome.exitCode).toBe(EXIT.fail);
    expect(outcome.lines.join('\n')).toMatch(/build candidate FAILED: footing\.config\.yaml:15:5: builds\.candidate: build command .* exited with status 3/);
    const results = JSON.parse(readFileSync(path.join(repo.dir, 'out', 'footing', 'results.json'), 'utf8')) as ResultsFile;
    expect(validateResults(results).ok).toBe(true);
    const byBuild = (name: string) => results.runs.filter((r) => r.build === name);
    expect(byBuild('main').map((r) => r.status)).toEqual(['pass', 'pass']);
    for (const run of byBuild('candidate')) {
      expect(run.status).toBe('error');
      expect(run.error).toMatchObject({ reason: 'build-failed', stderrTail: 'cc: fatal: no input files' });
      expect(run.error?.message).toContain('footing.config.yaml:15:5: builds.candidate');
    }
  });

  it('records the resolved commit of each git build in results.json and gates main against the branch', async () => {
    const repo = createControllerRepo({ checkout: 'feature' });
    const outcome = await runConfiguredSuite({ suite: 'merge', baseline: 'main', cwd: repo.dir, quiet: true }, quick);
    expect(outcome.exitCode).toBe(EXIT.fail);
    const results = outcome.results as ResultsFile;
    expect(results.builds.map((b) => [b.name, b.commit, b.dirty])).toEqual([
      ['main', repo.commits.main, false],
      ['candidate', repo.commits.feature, false],
    ]);
    expect(readFileSync(path.join(repo.dir, 'out', 'footing', 'gate.md'), 'utf8')).toMatch(/friction margin/);
    expect(readdirSync(path.join(repo.dir, '.footing-cache', 'git')).filter((n) => n.endsWith('.json'))).toHaveLength(2);
  });
});
