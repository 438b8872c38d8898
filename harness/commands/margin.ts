// `footing margin` as a function the CLI wires (harness/cli/main.ts) and tests call directly.
//
//   footing margin [paths..] --build SPEC [--build SPEC ...] --out DIR [--tolerance 0.01] [--jobs N]
//
// Exit codes as footing run: 0 every pair passes as written (margins measured), 1 a pair fails or
// errors as written (its margins are still measured where possible), 2 bad input, 3 internal.

import { EXIT } from '../run/suite.js';
import { runMargins, type MarginQuantity } from '../margin/runMargins.js';

export interface MarginCommandArgs {
  paths?: string[];
  build: string[];
  out: string;
  tolerance?: number;
  jobs?: number;
  /** Only one of the searches (default both). */
  only?: MarginQuantity;
  cwd?: string;
  /** Called with each line as it happens (the CLI prints to stderr). */
  log?: (line: string) => void;
}

export async function runMarginCommand(args: MarginCommandArgs): Promise<{ exitCode: number; lines: string[] }> {
  try {
    const outcome = await runMargins({
      paths: args.paths,
      builds: args.build,
      outDir: args.out,
      tolerance: args.tolerance,
      jobs: args.jobs,
      quantities: args.only ? [args.only] : undefined,
      cwd: args.cwd,
      log: args.log,
    });
    return { exitCode: outcome.exitCode, lines: outcome.lines };
  } catch (error) {
    return { exitCode: EXIT.internal, lines: [`footing margin: internal error: ${(error as Error).stack ?? String(error)}`] };
  }
}
