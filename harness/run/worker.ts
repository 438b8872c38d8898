// Worker-thread side of the suite pool: one task = one (scenario × build) pair.
import { runOne, type RunTask } from './runOne.js';
import type { RunResult } from '../results/types.js';

export default async function runTask(task: RunTask): Promise<RunResult> {
  return runOne(task);
}
