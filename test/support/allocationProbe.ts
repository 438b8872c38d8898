// Runs an allocation probe (a script that measures with measureSteadyAllocation and prints the
// result as JSON) in a fresh Node process with on-stack replacement off.
//
// Why a fresh process: V8's optimised code carries the type feedback of every earlier call in the
// process, and other tests' calls (other builds, other step shapes) have left hot functions in
// baseline code that boxes doubles — 2 to 183 collections where the code itself allocates nothing
// (stepScoring.test.ts in a full run; allocation.test.ts across builds). A real run gives each
// build spec a run thread of its own. Why OSR off: an OSR compile racing a deoptimisation has left
// a function unoptimised for good under machine load (test/builds/reference/allocation.test.ts).
// The check is of our code; those are V8 tiering states, recorded in DEVELOPERS.md.

import { execFile } from 'node:child_process';
import { promisify } from 'node:util';

export interface ProbeResult {
  collections: number;
  bytesPerCall: number;
  attempts: number;
}

export async function runAllocationProbe(script: string, args: string[] = []): Promise<ProbeResult> {
  const { stdout } = await promisify(execFile)(process.execPath, ['--no-use-osr', '--import', 'tsx', script, ...args], { timeout: 60_000 });
  return JSON.parse(stdout) as ProbeResult;
}
