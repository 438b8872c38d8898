// The CI scripts of ci/ — the ones README.md shows — run as CI would run them: bash, from the
// controller repository, calling Footing's real command line (bin/footing.js) against a temporary
// git repository with two versions of a small controller, one of which loses friction margin.

import { spawnSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { XMLParser } from 'fast-xml-parser';
import { beforeAll, describe, expect, it } from 'vitest';
import type { ResultsFile } from '../../../harness/results/types.js';
import { validateResults } from '../../../harness/results/validate.js';
import { createControllerRepo, FOOTING_COMMAND, FOOTING_ROOT, type ControllerRepo } from './repo.js';

const CI = path.join(FOOTING_ROOT, 'ci');

function script(repo: string, name: string, args: string[] = [], env: Record<string, string> = {}) {
  const run = spawnSync('bash', [path.join(CI, name), ...args], {
    cwd: repo,
    encoding: 'utf8',
    // CI=true: plain progress lines, as on a CI machine.
    env: { ...process.env, CI: 'true', FOOTING: FOOTING_COMMAND, ...env },
  });
  return { status: run.status, stdout: run.stdout, stderr: run.stderr, all: `${run.stdout}\n${run.stderr}` };
}

function footing(repo: string, args: string[]) {
  const run = spawnSync('node', [path.join(FOOTING_ROOT, 'bin', 'footing.js'), ...args], { cwd: repo, encoding: 'utf8', env: { ...process.env, CI: 'true' } });
  return { status: run.status, stdout: run.stdout, stderr: run.stderr };
}

const readResults = (dir: string) => JSON.parse(readFileSync(path.join(dir, 'results.json'), 'utf8')) as ResultsFile;

describe('README CI scripts against a controller repository', () => {
  let branch: ControllerRepo;
  beforeAll(() => {
    branch = createControllerRepo({ checkout: 'feature' });
  });

  it('merge-gate.sh builds main and the branch from git, runs, gates and exits 1 for the margin-losing branch', () => {
    const run = script(branch.dir, 'merge-gate.sh');
    expect(run.status, run.all).toBe(1);
    // The verdict line says which rule, scenario and builds block.
    expect(run.stdout).toMatch(/footing merge gate: BLOCKS the merge — block — stand-d\w+ \(main → candidate\): stance friction margin (min|p05) fell by 0\.[1-3]/);
    expect(run.stderr).toMatch(/build main: git main → [0-9a-f]{12} \(built in/);
    expect(run.stderr).toMatch(/build candidate: git HEAD → [0-9a-f]{12} \(built in/);
    const out = path.join(branch.dir, 'out', 'merge');
    // The candidate squeezes with 0.8 of the estimated friction instead of 0.5: the expected loss
    // of margin is about 0.3 (fixtures/controller/src/controller.mjs), far over the 0.02 allowed.
    const gate = readFileSync(path.join(out, 'gate.md'), 'utf8');
    expect(gate).toMatch(/block/);
    expect(gate).toMatch(/friction margin p05 fell by 0\.[1-3]/);
    const results = readResults(out);
    expect(validateResults(results).ok).toBe(true);
    expect(results.builds.map((b) => [b.name, b.commit])).toEqual([
      ['main', branch.commits.main],
      ['candidate', branch.commits.feature],
    ]);
    const xml = new XMLParser({ ignoreAttributes: false }).parse(readFileSync(path.join(out, 'junit.xml'), 'utf8'));
    expect([xml.testsuites.testsuite].flat().map((s: Record<string, string>) => s['@_name'])).toEqual(['main', 'candidate']);
  });

  it('nightly.sh runs the nightly suite over every build, reusing the cached builds, and exits 0 when all runs pass', () => {
    const run = script(branch.dir, 'nightly.sh');
    expect(run.status, run.all).toBe(0);
    expect(run.stderr).toMatch(/build main: git main → [0-9a-f]{12} \(cached\)/);
    expect(run.stderr).toMatch(/build candidate: git HEAD → [0-9a-f]{12} \(cached\)/);
    expect(run.stdout).toContain('footing nightly: exit 0 — JUnit out/nightly/junit.xml');
    expect(readResults(path.join(branch.dir, 'out', 'nightly')).runs).toHaveLength(4);
  });

  it('shard.sh K N on each machine, then merge-shards.sh, gives the same verdict as the unsharded gate', () => {
    const env = { FOOTING_SUITE: 'merge' };
    for (const k of ['1', '2']) {
      const shard = script(branch.dir, 'shard.sh', [k, '2'], env);
      expect(shard.status, shard.all).toBe(0);
    }
    const merged = script(branch.dir, 'merge-shards.sh', [], { FOOTING_BASELINE: 'main' });
    expect(merged.status, merged.all).toBe(1);
    const out = path.join(branch.dir, 'out', 'merged');
    expect(readResults(out).runs.map((r) => `${r.scenario.id}/${r.build}`).sort()).toEqual(['stand-damp/candidate', 'stand-damp/main', 'stand-dry/candidate', 'stand-dry/main']);
    expect(readFileSync(path.join(out, 'gate.md'), 'utf8')).toMatch(/friction margin/);
  });

  it('merge-gate.sh exits 0 for a branch that keeps the margin', () => {
    const tidy = createControllerRepo({ checkout: 'tidy' });
    const run = script(tidy.dir, 'merge-gate.sh');
    expect(run.status, run.all).toBe(0);
    // A comment-only change holds with the default policy: loop time is judged on the paired
    // measurement, so the machine's load cannot block it.
    expect(run.stdout).toContain('footing merge gate: holds — hold — nothing the candidate changed breaks a rule');
  });

  it('exits 2 with the config file and item named for an unknown suite', () => {
    const run = script(branch.dir, 'nightly.sh', [], { FOOTING_SUITE: 'nighlty' });
    expect(run.status).toBe(2);
    expect(run.stderr).toContain('--suite nighlty: footing.config.yaml has no suite of that name; did you mean "nightly"?');
  });

  it('footing config --print and footing cache --clear work from the command line', () => {
    const printed = footing(branch.dir, ['config', '--print', '--suite', 'merge']);
    expect(printed.status, printed.stderr).toBe(0);
    expect(printed.stdout).toMatch(/^suite\s+merge\s+\[flag --suite\]$/m);
    expect(printed.stdout).toContain(`→ ${branch.commits.main.slice(0, 12)}`);
    const cleared = footing(branch.dir, ['cache', '--clear']);
    expect(cleared.status, cleared.stderr).toBe(0);
    expect(cleared.stdout).toMatch(/^removed 2 cached git builds from \.footing-cache$/m);
  });

  it('README shows exactly these scripts', () => {
    const readme = readFileSync(path.join(FOOTING_ROOT, 'README.md'), 'utf8');
    for (const name of ['nightly.sh', 'merge-gate.sh', 'shard.sh', 'merge-shards.sh']) {
      expect(readme, `README.md should hold ci/${name} verbatim`).toContain(readFileSync(path.join(CI, name), 'utf8').trimEnd());
    }
  });
});
