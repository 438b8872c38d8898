// ci/nightly.sh with the history: run as CI runs it (bash, from the controller repository, the real
// command line) against the 16-commit repository of bisectRepo.ts, with a scenario whose
// acceptance the over-trusting commits fail.

import { spawnSync } from 'node:child_process';
import { readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import type { BisectRecord } from '../../harness/history/bisect/types.js';
import { BUILD_COMMAND, FOOTING_COMMAND, FOOTING_ROOT, git } from '../builds/git/repo.js';
import { createBisectRepo, OVERTRUSTING_COMMIT } from './bisectRepo.js';

const CONFIG = `# footing.config.yaml of the bisect test repository (invented)
version: 1
suites:
  nightly: [scenarios/stand-margin.yaml]
git:
  build: ${BUILD_COMMAND}
  entry: dist/controller.mjs
builds:
  controller: git:HEAD
jobs: 1
out: out/footing
`;

// Minimum friction margin on stand-damp, measured with `footing run` of the fixture controller
// from the settled start: 0.521 at TRUST 1.0 and 0.233 at TRUST 1.6 (no landing transient any
// more: min equals p05). An acceptance minimum of 0.4 passes the first and fails the second.
function marginScenario(dir: string): void {
  const damp = readFileSync(path.join(dir, 'scenarios', 'stand-damp.yaml'), 'utf8');
  writeFileSync(path.join(dir, 'scenarios', 'stand-margin.yaml'), damp.replace('id: stand-damp', 'id: stand-margin').replace('acceptance: { mustNotFall: true }', 'acceptance: { mustNotFall: true, minFrictionMargin: 0.4 }'));
}

function nightly(dir: string, env: Record<string, string> = {}) {
  const run = spawnSync('bash', [path.join(FOOTING_ROOT, 'ci', 'nightly.sh')], { cwd: dir, encoding: 'utf8', env: { ...process.env, CI: 'true', FOOTING: FOOTING_COMMAND, ...env } });
  return { status: run.status, stdout: run.stdout, all: `${run.stdout}\n${run.stderr}` };
}

describe('ci/nightly.sh with the history', () => {
  it('adds each night to the history, and on a failing night bisects from the last good night to name commit 11', () => {
    const repo = createBisectRepo();
    writeFileSync(path.join(repo.dir, 'footing.config.yaml'), CONFIG);
    marginScenario(repo.dir);
    git(repo.dir, 'add', '-A');
    git(repo.dir, 'commit', '--quiet', '--amend', '--no-edit');
    const head = git(repo.dir, 'rev-parse', 'HEAD').trim();
    // A night at commit 3 passes (the amended tip carries the config; earlier commits get it too).
    git(repo.dir, 'checkout', '--quiet', repo.commits[3]);
    writeFileSync(path.join(repo.dir, 'footing.config.yaml'), CONFIG);
    marginScenario(repo.dir);
    const good = nightly(repo.dir);
    expect(good.status, good.all).toBe(0);
    git(repo.dir, 'checkout', '--quiet', '--force', 'main');
    expect(git(repo.dir, 'rev-parse', 'HEAD').trim()).toBe(head);

    const failing = nightly(repo.dir, { FOOTING_BISECT: '1' });
    expect(failing.status, failing.all).toBe(1);
    expect(failing.stdout).toContain(`footing nightly: bisect from the last good night (${repo.commits[3]}) exit 0`);
    const record = JSON.parse(readFileSync(path.join(repo.dir, 'out', 'nightly', 'bisect', 'bisect.json'), 'utf8')) as BisectRecord;
    expect(record.firstBad?.commit).toBe(repo.commits[OVERTRUSTING_COMMIT]);
    const listed = spawnSync('node', [path.join(FOOTING_ROOT, 'bin', 'footing.js'), 'history', 'list'], { cwd: repo.dir, encoding: 'utf8' });
    expect(listed.stdout.split('\n')[0]).toBe('2 nights in .footing/history.sqlite');
    expect(listed.stdout).toContain(repo.commits[3].slice(0, 12));
    expect(listed.stdout).toContain(head.slice(0, 12));
  });
});
