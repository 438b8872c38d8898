// Build provenance: the commit and dirtiness of the checkout a build's entry lives in, read from
// a throw-away git repository made for the test; null outside any checkout.

import { execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildManifest, gitProvenance, provenanceSource } from '../../../harness/builds/provenance.js';
import { parseBuildSpec } from '../../../harness/builds/spec.js';
import { REPO_ROOT } from './helpers.js';

let root: string;
let repo: string;
let outside: string;

function git(...args: string[]): string {
  return execFileSync('git', ['-c', 'user.name=Test', '-c', 'user.email=test@example.invalid', ...args], {
    cwd: repo,
    encoding: 'utf8',
  }).trim();
}

beforeAll(() => {
  root = mkdtempSync(join(tmpdir(), 'footing-provenance-'));
  repo = join(root, 'controller');
  outside = join(root, 'loose');
  mkdirSync(join(repo, 'src'), { recursive: true });
  mkdirSync(outside);
  writeFileSync(join(repo, 'src', 'controller.js'), 'export function createController() {}\n');
  writeFileSync(join(outside, 'controller.js'), 'export default () => ({})\n');
  writeFileSync(join(outside, 'ctl.py'), 'print()\n');
  git('init', '-q');
  git('add', '.');
  git('commit', '-q', '-m', 'first');
});

afterAll(() => rmSync(root, { recursive: true, force: true }));

describe('buildManifest', () => {
  it('records the commit of a clean checkout and dirty = false', async () => {
    const spec = parseBuildSpec('tip=src/controller.js?gain=2', repo);
    const manifest = await buildManifest(spec);
    expect(manifest).toEqual({
      name: 'tip',
      kind: 'module',
      entry: join(repo, 'src', 'controller.js'),
      args: [],
      options: { gain: 2 },
      source: join(repo, 'src', 'controller.js'),
      git: { root: expect.stringContaining('controller'), commit: git('rev-parse', 'HEAD'), dirty: false },
    });
    expect(manifest.git?.commit).toMatch(/^[0-9a-f]{40}$/);
  });

  it('reports dirty = true for a modified file and for an untracked file', async () => {
    const spec = parseBuildSpec('tip=src/controller.js', repo);
    const file = join(repo, 'src', 'controller.js');
    writeFileSync(file, 'export function createController() { return 1; }\n');
    expect((await buildManifest(spec)).git?.dirty).toBe(true);
    writeFileSync(file, 'export function createController() {}\n');
    expect((await buildManifest(spec)).git?.dirty).toBe(false);
    writeFileSync(join(repo, 'notes.txt'), 'new\n');
    expect((await buildManifest(spec)).git?.dirty).toBe(true);
    rmSync(join(repo, 'notes.txt'));
  });

  it('gives git = null for an entry outside any checkout', async () => {
    const manifest = await buildManifest(parseBuildSpec('loose=controller.js', outside));
    expect(manifest.source).toBe(join(outside, 'controller.js'));
    expect(manifest.git).toBeNull();
  });

  it('looks at the script, not the interpreter, for exec:python3 script.py specs', async () => {
    const spec = parseBuildSpec('py=exec:python3 -u ctl.py --fast', outside);
    expect(provenanceSource(spec)).toBe(join(outside, 'ctl.py'));
    const inRepo = parseBuildSpec('py=exec:python3 src/controller.js', repo);
    expect((await buildManifest(inRepo)).git?.commit).toBe(git('rev-parse', 'HEAD'));
    expect(provenanceSource(parseBuildSpec('bin=exec:some-command --flag', outside))).toBeNull();
  });

  it('records the Footing checkout itself for reference builds', async () => {
    const manifest = await buildManifest(parseBuildSpec('ref:qp', REPO_ROOT));
    expect(manifest.kind).toBe('reference');
    const footing = await gitProvenance(REPO_ROOT);
    // This test runs inside the Footing checkout (or an export of it without .git: then both null).
    expect(manifest.git).toEqual(footing);
  });
});
