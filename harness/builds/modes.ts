// Leg modes an in-process build wrote, checked like a process build's (messages.ts accepts only
// 0 and 1 on the wire). Action.mode is a Uint8Array, so 7 stays 7 there; a build that swapped in
// an array of its own could also hand over NaN or 0.5. Anything but 0 (swing) or 1 (stance) ends
// the run: the plant would otherwise read it as some mode the build never meant.
// (NaN written *into* the harness's Uint8Array is stored as 0 by the language itself and cannot
// be told from swing afterwards; docs/protocol.md says so.)

import type { Action } from './interface.js';

export interface ModeProblem {
  reason: 'non-finite' | 'malformed';
  detail: string;
}

/** The first leg mode that is neither 0 nor 1, or null. Allocation-free on the healthy path. */
export function checkActionModes(action: Action, footCount: number): ModeProblem | null {
  const mode = action.mode as ArrayLike<unknown>;
  if (mode === null || typeof mode !== 'object' || mode.length !== footCount) {
    return { reason: 'malformed', detail: `mode must hold ${footCount} leg modes, got ${describeValue(mode)}` };
  }
  for (let i = 0; i < footCount; i++) {
    const value = mode[i];
    if (value !== 0 && value !== 1) {
      const finite = typeof value === 'number' && value - value === 0;
      return { reason: finite ? 'malformed' : 'non-finite', detail: `mode[${i}] = ${describeValue(value)}: expected 0 (swing) or 1 (stance)` };
    }
  }
  return null;
}

function describeValue(value: unknown): string {
  if (typeof value === 'number') return String(value);
  if (value !== null && typeof value === 'object' && 'length' in value) return `${(value as ArrayLike<unknown>).length} values`;
  return JSON.stringify(value) ?? String(value);
}
