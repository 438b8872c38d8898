// Lock files (harness/files/lock.ts): one owner, a clear answer naming the other owner, stale
// locks (dead pid, or a token this process no longer holds) taken over.
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, writeFileSync } from 'node:fs';
import { hostname, tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { readLockOwner, tryLock, waitForLock } from '../../harness/files/lock.js';

const fresh = () => path.join(mkdtempSync(path.join(tmpdir(), 'footing-lock-')), 'x.lock');

/** A pid that was alive a moment ago and is not now (a child that exited). */
function deadPid(): number {
  const child = spawnSync(process.execPath, ['-e', 'process.stdout.write(String(process.pid))'], { encoding: 'utf8' });
  return Number(child.stdout);
}

describe('lock files', () => {
  it('a second taker is refused with the first owner named, and gets it once released', () => {
    const file = fresh();
    const first = tryLock(file, 'first');
    expect(first.ok).toBe(true);
    const second = tryLock(file, 'second');
    expect(second.ok).toBe(false);
    if (!second.ok) expect(second.owner).toMatchObject({ pid: process.pid, host: hostname(), purpose: 'first' });
    if (first.ok) first.release();
    expect(existsSync(file)).toBe(false);
    const third = tryLock(file, 'third');
    expect(third.ok).toBe(true);
    if (third.ok) third.release();
  });

  it('takes over a lock whose owner is dead, and one of this pid under a token it no longer holds', () => {
    const file = fresh();
    const pid = deadPid();
    writeFileSync(file, JSON.stringify({ pid, host: hostname(), token: 'old', purpose: 'crashed run', startedAt: '2026-01-01T00:00:00Z' }));
    const taken = tryLock(file, 'me');
    expect(taken.ok && taken.takenOver?.pid).toBe(pid);
    if (taken.ok) taken.release();
    writeFileSync(file, JSON.stringify({ pid: process.pid, host: hostname(), token: 'forgotten', purpose: 'a crashed call', startedAt: '2026-01-01T00:00:00Z' }));
    const again = tryLock(file, 'me');
    expect(again.ok).toBe(true);
    expect(readLockOwner(file)?.purpose).toBe('me');
    if (again.ok) again.release();
  });

  it('waitForLock returns once the owner releases', async () => {
    const file = fresh();
    const first = tryLock(file, 'first');
    if (!first.ok) throw new Error('expected the lock');
    setTimeout(() => first.release(), 300);
    const second = await waitForLock(file, 'second', 30_000, 50);
    expect(second?.ok).toBe(true);
    second?.release();
  });
});
