// SIGINT and SIGTERM while a suite runs: stop it cleanly instead of dying mid-write. The first
// signal calls the handler (the suite aborts its pool, which kills every build's process group,
// keeps the runs saved so far and says how to resume); a second one exits at once. Exit codes
// follow the shell convention 128 + signal number.

export const SIGNAL_EXIT = { SIGINT: 130, SIGTERM: 143 } as const;
export type InterruptSignal = keyof typeof SIGNAL_EXIT;
export type SignalExitCode = (typeof SIGNAL_EXIT)[InterruptSignal];
const SIGNALS = Object.keys(SIGNAL_EXIT) as InterruptSignal[];

/** Calls `handler` on the first SIGINT/SIGTERM; returns the function that stops listening. */
export function onInterrupt(handler: (signal: InterruptSignal) => void): () => void {
  let seen = false;
  const listener = (signal: InterruptSignal) => {
    if (seen) process.exit(SIGNAL_EXIT[signal]);
    seen = true;
    handler(signal);
  };
  for (const signal of SIGNALS) process.on(signal, listener);
  return () => {
    for (const signal of SIGNALS) process.off(signal, listener);
  };
}

/** The line that tells the person at the terminal what was kept and how to go on. */
export function resumeHint(signal: InterruptSignal, saved: number, total: number, runsDir: string): string {
  return `interrupted by ${signal}: ${saved} of ${total} runs are saved in ${runsDir}; run the same command again with --resume to finish the rest`;
}

/** A saved run worth keeping on --resume: not one that failed for a reason of the moment. */
export function keepOnResume(reason: string | undefined): boolean {
  // run-timeout depends on the machine's load, build-failed on a checkout or toolchain that may be fixed.
  return reason !== 'run-timeout' && reason !== 'build-failed';
}
