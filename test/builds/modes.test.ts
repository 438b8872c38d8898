// In-process leg modes are refused like a process build's: only 0 (swing) and 1 (stance).
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { createAction, type Action } from '../../harness/builds/interface.js';
import { BuildFailure, guardController } from '../../harness/builds/loader.js';
import { checkActionModes } from '../../harness/builds/modes.js';
import { newObservation } from './bridge/helpers.js';

function guardedWriting(write: (action: Action) => void) {
  return guardController({ telemetryNames: [], tick: (_obs, action) => write(action) }, 'm');
}

describe('leg modes of an in-process build', () => {
  it('accepts 0 and 1 in any combination', () => {
    fc.assert(
      fc.property(fc.array(fc.constantFrom(0, 1), { minLength: 4, maxLength: 4 }), (modes) => {
        const action = createAction(4, 0);
        action.mode.set(modes);
        expect(checkActionModes(action, 4)).toBeNull();
      }),
    );
  });

  it('refuses 7 written into the mode array as malformed, naming the leg and the value', () => {
    const build = guardedWriting((action) => (action.mode[2] = 7));
    const action = createAction(4, 0);
    let caught: unknown;
    try {
      build.tick(newObservation(), action);
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(BuildFailure);
    expect((caught as BuildFailure).reason).toBe('malformed');
    expect((caught as BuildFailure).message).toMatch(/build 'm' at tick 0: mode\[2\] = 7: expected 0 \(swing\) or 1 \(stance\)/);
  });

  it('refuses NaN, fractions and wrong lengths in a mode array the build swapped in', () => {
    fc.assert(
      fc.property(fc.oneof(fc.constant(Number.NaN), fc.double({ noNaN: true }).filter((x) => x !== 0 && x !== 1), fc.integer({ min: 2, max: 255 })), fc.nat(3), (bad, leg) => {
        const action = createAction(4, 0);
        const swapped = [1, 1, 1, 1];
        swapped[leg] = bad;
        (action as { mode: unknown }).mode = swapped;
        const problem = checkActionModes(action, 4);
        expect(problem).not.toBeNull();
        expect(problem!.reason).toBe(Number.isFinite(bad) ? 'malformed' : 'non-finite');
        expect(problem!.detail).toContain(`mode[${leg}]`);
      }),
    );
    const short = createAction(4, 0);
    (short as { mode: unknown }).mode = new Uint8Array(3);
    expect(checkActionModes(short, 4)!.detail).toMatch(/mode must hold 4 leg modes, got 3 values/);
  });
});
