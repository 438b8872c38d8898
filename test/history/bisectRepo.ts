// A temporary controller repository of 16 commits for the bisect tests, from the machinery of
// test/builds/git/repo.ts (its fixture controller, build recipe and config): commit 0 is the
// honest controller, commits 1…15 each change a note, and commit 11 also makes the controller
// trust 1.6× the friction estimate (the over-trusting factor), which the gate blocks. With
// `unbuildable`, that commit moves the controller source away (the build's cp fails) and the next
// commit moves it back.

import { cpSync, mkdtempSync, readFileSync, renameSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { CONFIG_TEXT, FIXTURE, git } from '../builds/git/repo.js';

export const COMMITS = 16;
export const OVERTRUSTING_COMMIT = 11;

export function createBisectRepo(options: { unbuildable?: number } = {}): { dir: string; commits: string[] } {
  const dir = mkdtempSync(path.join(tmpdir(), 'footing-bisect-'));
  git(dir, 'init', '--quiet', '--initial-branch=main');
  cpSync(FIXTURE, dir, { recursive: true });
  writeFileSync(path.join(dir, '.gitignore'), '.footing-cache/\n.footing/\nout/\ndist/\n');
  writeFileSync(path.join(dir, 'footing.config.yaml'), CONFIG_TEXT);
  writeFileSync(path.join(dir, 'NOTES'), 'step 0\n');
  git(dir, 'add', '-A');
  git(dir, 'commit', '--quiet', '-m', 'step 0: controller v1');
  const commits = [git(dir, 'rev-parse', 'HEAD').trim()];
  const source = path.join(dir, 'src', 'controller.mjs');
  const moved = path.join(dir, 'src', 'controller.mjs.moved');
  for (let k = 1; k < COMMITS; k++) {
    writeFileSync(path.join(dir, 'NOTES'), `step ${k}\n`);
    let subject = `step ${k}: notes`;
    if (k === OVERTRUSTING_COMMIT) {
      writeFileSync(source, readFileSync(source, 'utf8').replace('const TRUST = 1.0;', 'const TRUST = 1.6;'));
      subject = `step ${k}: trust the friction estimate more`;
    }
    if (k === options.unbuildable) {
      renameSync(source, moved);
      subject = `step ${k}: move the controller source (breaks the build)`;
    } else if (options.unbuildable !== undefined && k === options.unbuildable + 1) {
      renameSync(moved, source);
      subject = `step ${k}: move the controller source back`;
    }
    git(dir, 'add', '-A');
    git(dir, 'commit', '--quiet', '-m', subject);
    commits.push(git(dir, 'rev-parse', 'HEAD').trim());
  }
  return { dir, commits };
}
