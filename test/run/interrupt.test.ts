// SIGINT and SIGTERM to `footing run` (harness/run/interrupt.ts): the suite stops, every build's
// process group is killed, the runs saved so far stay resumable, and the exit code is 128 + the
// signal number with a line saying how to resume.
import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { keepOnResume, resumeHint } from '../../harness/run/interrupt.js';
import { processesWith, survivorsAfter, uniqueMarker } from '../support/processes.js';

const BRIEF = 'test/run/fixtures/brief';
const SLOW = 'test/run/fixtures/slow_build.py';

describe('footing run interrupted by a signal', () => {
  it.each([
    ['SIGINT', 130],
    ['SIGTERM', 143],
  ] as const)('%s: exits %i, says how to resume, keeps the finished run and leaves no build process', async (signal, code) => {
    const out = mkdtempSync(path.join(tmpdir(), `footing-${signal}-`));
    const marker = uniqueMarker(signal);
    const child = spawn(process.execPath, ['bin/footing.js', 'run', BRIEF, '-b', 'ref:nominal', '-b', `slow=exec:python3 ${SLOW} 0.05 ${marker}`, '--jobs', '2', '--out', out, '--quiet'], {
      stdio: ['ignore', 'ignore', 'pipe'],
    });
    let stderr = '';
    child.stderr!.on('data', (chunk: Buffer) => (stderr += chunk.toString()));
    const exited = new Promise<number | null>((resolve) => child.on('exit', (status) => resolve(status)));
    const saved = path.join(out, 'runs', 'brief-stand__nominal.json');
    // Wait until the fast pair is saved and the slow build (and its grandchild) is running.
    for (let k = 0; k < 600 && !(existsSync(saved) && processesWith(marker).length >= 2); k++) await new Promise((r) => setTimeout(r, 50));
    expect(processesWith(marker).length).toBeGreaterThanOrEqual(2);
    child.kill(signal);
    expect(await exited).toBe(code);
    expect(stderr).toMatch(new RegExp(`interrupted by ${signal}: 1 of 2 runs are saved in .*runs; run the same command again with --resume`));
    expect(await survivorsAfter(marker)).toEqual([]);
    expect(readdirSync(path.join(out, 'runs')).filter((n) => n.endsWith('.json'))).toEqual(['brief-stand__nominal.json']);
    expect(JSON.parse(readFileSync(saved, 'utf8')).result.status).toBe('pass');
    // Interrupted before the end: no summary pretends the suite was complete.
    expect(existsSync(path.join(out, 'results.json'))).toBe(false);
  });
});

describe('what --resume keeps', () => {
  it('keeps passes, failures and build errors; runs again what its allowance stopped or a build that could not be prepared', () => {
    expect(keepOnResume(undefined)).toBe(true);
    expect(keepOnResume('threw')).toBe(true);
    expect(keepOnResume('run-timeout')).toBe(false);
    expect(keepOnResume('build-failed')).toBe(false);
  });

  it('the resume line names the signal, the count and the folder', () => {
    expect(resumeHint('SIGINT', 3, 8, 'out/runs')).toBe('interrupted by SIGINT: 3 of 8 runs are saved in out/runs; run the same command again with --resume to finish the rest');
  });
});
