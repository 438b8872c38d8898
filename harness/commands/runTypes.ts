// The options and outcome of `footing run` (runSuite), apart so that run.ts and runTail.ts share them.

import type { PreparedBuild } from '../run/prepare.js';
import type { GatePolicy } from '../gate/defaults.js';
import type { ResultsFile } from '../results/types.js';
import type { CommandOutcome, SuiteCommandOptions } from './skeleton.js';

export interface SuiteRunOptions extends SuiteCommandOptions {
  /** Spec texts (`--build`) or builds prepared elsewhere, in the order results list them. */
  builds: (string | PreparedBuild)[];
  /** Replaces every scenario's control.loopBudget_us (a machine's budget, not the scenario's content). */
  loopBudget_us?: number;
  trace?: boolean;
  traceEveryNth?: number;
  /** K/N, or `auto`: from the CI matrix or job array's environment (run/shard.ts). */
  shard?: string;
  /** The count for `--shard auto` where the scheduler gives only the index (Kubernetes). */
  shardCount?: number;
  /** The environment `--shard auto` reads (default process.env). */
  env?: Readonly<Record<string, string | undefined>>;
  baseline?: string;
  policyFile?: string;
  /** A policy already loaded (e.g. inline in footing.config.yaml); policyFile wins when both are given. */
  policy?: GatePolicy;
  resume?: boolean;
  quiet?: boolean;
  /** Measure every build with the bench (governor rate, tick time, real-time factor) and attach it. */
  bench?: boolean;
}

export interface SuiteRunOutcome extends CommandOutcome {
  results?: ResultsFile;
}
