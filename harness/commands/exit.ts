// The exit codes of every footing command, the one place they are defined (docs/scoring.md lists
// them for users). Engines below the commands return outcomes (run statuses, a gate verdict, bad
// input as lines); the commands turn those into one of these. The two signal codes follow the
// shell's 128 + signal number and are defined beside the signal handling (run/interrupt.ts).

import { SIGNAL_EXIT } from '../run/interrupt.js';

export const EXIT = {
  /** Every run passed / the gate holds / every build measured. */
  pass: 0,
  /** Some run failed or errored / the gate blocks / some build could not be measured. */
  fail: 1,
  /** Bad input: a clear message, nothing run. */
  badInput: 2,
  /** A bug in footing itself. */
  internal: 3,
  /** Stopped by SIGINT (Ctrl-C); saved runs kept for --resume. */
  interrupted: SIGNAL_EXIT.SIGINT,
  /** Stopped by SIGTERM; saved runs kept for --resume. */
  terminated: SIGNAL_EXIT.SIGTERM,
} as const;

export type ExitCode = (typeof EXIT)[keyof typeof EXIT];

/** pass when every run passed, else fail (failed and errored runs alike). */
export function exitCodeOfRuns(runs: readonly { status: 'pass' | 'fail' | 'error' }[]): ExitCode {
  return runs.every((run) => run.status === 'pass') ? EXIT.pass : EXIT.fail;
}
