// What `ps` says is still alive: tests that stop builds from outside (allowance, signal, crash)
// check that nothing carrying their marker outlived the run.
import { execFileSync } from 'node:child_process';

/** Pids of live processes whose command line contains `marker` (zombies excluded). */
export function processesWith(marker: string): number[] {
  const out = execFileSync('ps', ['-eo', 'pid=,stat=,args='], { encoding: 'utf8' });
  return out
    .split('\n')
    .map((line) => line.trim().match(/^(\d+)\s+(\S+)\s+(.*)$/))
    .filter((m): m is RegExpMatchArray => m !== null && !m[2].startsWith('Z') && m[3].includes(marker) && !m[3].startsWith('ps '))
    .map((m) => Number(m[1]));
}

/** Polls until no process carries `marker` or `tries` polls of 100 ms passed; returns the survivors. */
export async function survivorsAfter(marker: string, tries = 30): Promise<number[]> {
  let left = processesWith(marker);
  for (let k = 0; k < tries && left.length > 0; k++) {
    await new Promise((resolve) => setTimeout(resolve, 100));
    left = processesWith(marker);
  }
  return left;
}

export function uniqueMarker(name: string): string {
  return `footing-test-${name}-${process.pid}-${Math.random().toString(36).slice(2, 10)}`;
}
