// One writer per results folder (harness/run/outputLock.ts): a second concurrent `footing run`
// into one --out is refused (exit 2) naming the first one's pid, a lock left by a dead run is taken
// over, and a symbolic link inside the folder is never followed to delete files.
import { spawn } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readdirSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { OUTPUT_LOCK_NAME } from '../../harness/run/outputLock.js';
import { EXIT } from '../../harness/commands/exit.js';
import { runSuite } from '../../harness/commands/run.js';
import { survivorsAfter, uniqueMarker } from '../support/processes.js';

const BRIEF = 'test/run/fixtures/brief';
const fresh = (name: string) => mkdtempSync(path.join(tmpdir(), `footing-out-${name}-`));

describe('one writer per results folder', () => {
  it('a second run into the folder of a running one is refused with exit 2, naming its pid; the first completes', async () => {
    const out = fresh('two');
    const marker = uniqueMarker('lock');
    const child = spawn(process.execPath, ['bin/footing.js', 'run', BRIEF, '-b', `slow=exec:python3 test/run/fixtures/slow_build.py 0.004 ${marker}`, '--out', out, '--quiet'], { stdio: 'ignore' });
    const exited = new Promise<number | null>((resolve) => child.on('exit', resolve));
    for (let k = 0; k < 400 && !existsSync(path.join(out, OUTPUT_LOCK_NAME)); k++) await new Promise((r) => setTimeout(r, 25));
    const second = await runSuite({ paths: [BRIEF], builds: ['ref:nominal'], outDir: out, quiet: true });
    expect(second.exitCode).toBe(EXIT.badInput);
    expect(second.lines.join('\n')).toMatch(new RegExp(`is being written by another footing run \\(pid ${child.pid} on .*\\); wait for it to finish or choose another --out`));
    expect(await exited).toBe(0);
    expect(readdirSync(path.join(out, 'runs'))).toEqual(['brief-stand__slow.json']);
    expect(existsSync(path.join(out, OUTPUT_LOCK_NAME))).toBe(false);
    expect(await survivorsAfter(marker)).toEqual([]);
  });

  it('takes over the lock of a run that died without releasing it', async () => {
    const out = fresh('stale');
    mkdirSync(out, { recursive: true });
    writeFileSync(path.join(out, OUTPUT_LOCK_NAME), JSON.stringify({ pid: 2 ** 22 + 12345, host: (await import('node:os')).hostname(), token: 't', purpose: 'footing run', startedAt: '2026-01-01T00:00:00Z' }));
    const outcome = await runSuite({ paths: [BRIEF], builds: ['ref:nominal'], outDir: out, quiet: true });
    expect(outcome.exitCode).toBe(EXIT.pass);
    expect(outcome.lines.join('\n')).toMatch(/took over the lock of .* left by pid 4206649, which is no longer running/);
  });

  it('refuses a runs/ folder that is a symbolic link, and leaves the files it points to alone', async () => {
    const out = fresh('link');
    const elsewhere = fresh('precious');
    writeFileSync(path.join(elsewhere, 'keep.json'), '{}');
    symlinkSync(elsewhere, path.join(out, 'runs'));
    const outcome = await runSuite({ paths: [BRIEF], builds: ['ref:nominal'], outDir: out, quiet: true });
    expect(outcome.exitCode).toBe(EXIT.badInput);
    expect(outcome.lines.join('\n')).toMatch(/runs is a symbolic link; footing deletes files there and never follows a link to do so/);
    expect(readdirSync(elsewhere)).toEqual(['keep.json']);
  });
});
