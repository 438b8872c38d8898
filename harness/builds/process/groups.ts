// Who else must know that a process build's group exists. The bridge announces each child's
// process group when it starts and when it is gone; the run thread forwards these to the parent
// (harness/run/pool.ts), which can then kill the group itself when it stops a run from outside
// (its wall-clock allowance, a signal): terminating a worker thread runs none of the bridge's
// clean-up, so without this the child would live on with parent 1.

export interface GroupListener {
  started(pgid: number): void;
  gone(pgid: number): void;
}

const listeners = new Set<GroupListener>();

export function watchProcessGroups(listener: GroupListener): () => void {
  listeners.add(listener);
  return () => listeners.delete(listener);
}

export function announceGroupStarted(pgid: number): void {
  for (const listener of listeners) listener.started(pgid);
}

export function announceGroupGone(pgid: number): void {
  for (const listener of listeners) listener.gone(pgid);
}

/** SIGKILL to a whole process group; false when it was already empty (ESRCH). */
export function killProcessGroup(pgid: number, signal: NodeJS.Signals = 'SIGKILL'): boolean {
  try {
    // A negative pid addresses the group a detached child leads.
    process.kill(-pgid, signal);
    return true;
  } catch {
    return false;
  }
}
