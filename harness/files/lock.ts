// Lock files: one owner at a time for a folder or a cache entry. The lock holds its owner (pid,
// host, a token, what for, since when) and is created complete or not at all (written to a
// temporary name, then hard-linked to the lock name, which fails if the lock exists). A lock whose
// owner is gone — a dead pid on this host, or this process's own pid under a token it no longer
// holds (a crashed call) — is stale and taken over. Residual race, accepted: two processes taking
// over the same stale lock in the same instant may both succeed.

import { randomBytes } from 'node:crypto';
import { linkSync, readFileSync, unlinkSync, writeFileSync } from 'node:fs';
import { hostname } from 'node:os';

export interface LockOwner {
  pid: number;
  host: string;
  token: string;
  purpose: string;
  startedAt: string;
}

export type LockAttempt = { ok: true; release(): void; takenOver: LockOwner | null } | { ok: false; owner: LockOwner };

/** Tokens of the locks this process holds now (a lock naming our pid but another token is stale). */
const held = new Map<string, string>();
process.on('exit', () => {
  for (const [file, token] of held) releaseIfOurs(file, token);
});

export function readLockOwner(file: string): LockOwner | null {
  try {
    const owner = JSON.parse(readFileSync(file, 'utf8')) as LockOwner;
    return Number.isInteger(owner.pid) && typeof owner.token === 'string' ? owner : null;
  } catch {
    return null;
  }
}

export function isAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    // EPERM: the process exists but belongs to someone else.
    return (error as NodeJS.ErrnoException).code === 'EPERM';
  }
}

function isStale(owner: LockOwner | null): boolean {
  if (owner === null) return true; // not a lock we can read: nobody can own it
  if (owner.host !== hostname()) return false; // another machine's process: cannot tell, assume alive
  if (owner.pid === process.pid) return ![...held.values()].includes(owner.token);
  return !isAlive(owner.pid);
}

function create(file: string, owner: LockOwner): boolean {
  const temp = `${file}.${owner.pid}-${owner.token}.tmp`;
  writeFileSync(temp, `${JSON.stringify(owner)}\n`);
  try {
    linkSync(temp, file);
    return true;
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === 'EEXIST') return false;
    throw error;
  } finally {
    unlinkSync(temp);
  }
}

function releaseIfOurs(file: string, token: string): void {
  if (held.get(file) !== token) return;
  held.delete(file);
  if (readLockOwner(file)?.token === token) {
    try {
      unlinkSync(file);
    } catch {
      // Already gone.
    }
  }
}

/** Takes the lock at `file` now, taking over a stale one, or says who holds it. */
export function tryLock(file: string, purpose: string): LockAttempt {
  const owner: LockOwner = { pid: process.pid, host: hostname(), token: randomBytes(8).toString('hex'), purpose, startedAt: new Date().toISOString() };
  let takenOver: LockOwner | null = null;
  for (let attempt = 0; attempt < 2; attempt++) {
    if (create(file, owner)) {
      held.set(file, owner.token);
      return { ok: true, takenOver, release: () => releaseIfOurs(file, owner.token) };
    }
    const current = readLockOwner(file);
    if (!isStale(current)) return { ok: false, owner: current as LockOwner };
    takenOver = current;
    try {
      unlinkSync(file);
    } catch {
      // Someone else removed it first; the next attempt decides.
    }
  }
  const winner = readLockOwner(file);
  return winner === null ? tryLock(file, purpose) : { ok: false, owner: winner };
}

/** Waits (polling) until the lock is free or stale, up to timeout_ms; null when it never was. */
export async function waitForLock(file: string, purpose: string, timeout_ms: number, poll_ms = 200): Promise<LockAttempt & { ok: true } | null> {
  const deadline = Date.now() + timeout_ms;
  for (;;) {
    const attempt = tryLock(file, purpose);
    if (attempt.ok) return attempt;
    if (Date.now() >= deadline) return null;
    await new Promise((resolve) => setTimeout(resolve, poll_ms));
  }
}
