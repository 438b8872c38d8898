// A module build in a thread of its own, seen from the run's thread as an ordinary OpenedBuild.
// The run's thread (plant, scorer, recorders) and the build's thread share only a block of memory
// (layout.ts): per tick the observation goes in, the action and the tick's wall time come out,
// and Atomics.wait/notify hand the turn over. So a build that patches Array.prototype, Math or a
// harness module patches its own thread's copies: the scorer of its run is out of its reach. The
// action is checked again on this side (finite numbers, modes 0/1): the guard in the build's thread
// runs where the build could tamper with it.

import { Worker } from 'node:worker_threads';
import type { Action, ControllerSetup, Observation } from '../interface.js';
import { checkActionFinite, type OpenedBuild } from '../opened.js';
import { BuildFailure, BUILD_FAILURE_REASONS, type BuildFailureReason } from '../process/failure.js';
import type { BuildSpec } from '../spec.js';
import { badModeIndex, CLOSE, createSharedTick, DONE, FAILED, IDLE, readAction, readError, STATE, TICK, writeObservation, type SharedTick } from './layout.js';
import type { BuildThreadMessage } from './layout.js';

const THREAD_URL = new URL('./thread.mjs', import.meta.url);
/** Time the build's thread has to close itself after CLOSE before it is terminated. */
const CLOSE_GRACE_ms = 1000;

export async function openIsolatedModule(spec: BuildSpec, setup: ControllerSetup): Promise<OpenedBuild> {
  const worker = new Worker(THREAD_URL, { workerData: { spec, setup } });
  const first = await new Promise<BuildThreadMessage | Error>((resolve) => {
    worker.once('message', resolve);
    worker.once('error', resolve);
    worker.once('exit', (code) => resolve(new Error(`its thread exited with code ${code} before it was ready`)));
  });
  worker.removeAllListeners();
  if (first instanceof Error || first.kind === 'failed') {
    await worker.terminate();
    if (first instanceof Error) throw new BuildFailure('threw', `build '${spec.name}': ${first.message}`);
    throw new BuildFailure(asReason(first.reason), first.message, first.stderrTail);
  }
  const shared = createSharedTick(setup.robot.hips_m.length, first.telemetryNames.length);
  let crash: string | null = null;
  worker.on('error', (error) => (crash = error instanceof Error ? error.message : String(error)));
  worker.postMessage({ buffer: shared.buffer });
  return new IsolatedModuleBuild(spec.name, Object.freeze([...first.telemetryNames]), worker, shared, setup.robot.hips_m.length, () => crash);
}

function asReason(reason: string): BuildFailureReason {
  return (BUILD_FAILURE_REASONS as readonly string[]).includes(reason) ? (reason as BuildFailureReason) : 'threw';
}

class IsolatedModuleBuild implements OpenedBuild {
  readonly kind = 'module' as const;
  readonly reportedCompute_us = Number.NaN;
  readonly about = '';
  loopTime_us = Number.NaN;
  private tickCount = 0;
  private closed = false;

  constructor(
    readonly name: string,
    readonly telemetryNames: readonly string[],
    private readonly worker: Worker,
    private readonly shared: SharedTick,
    private readonly footCount: number,
    private readonly crashed: () => string | null,
  ) {}

  tick(obs: Observation, action: Action): void {
    const { control } = this.shared;
    writeObservation(this.shared.obs, obs, this.footCount);
    Atomics.store(control, STATE, TICK);
    Atomics.notify(control, STATE);
    // No limit here: a build that never answers is stopped by its run's wall-clock allowance,
    // which terminates this thread and, with it, the build's.
    while (Atomics.load(control, STATE) === TICK) Atomics.wait(control, STATE, TICK);
    const state = Atomics.load(control, STATE);
    Atomics.store(control, STATE, IDLE);
    if (state === FAILED) {
      const { reasonCode, message } = readError(this.shared);
      throw new BuildFailure(BUILD_FAILURE_REASONS[reasonCode] ?? 'threw', message);
    }
    if (state !== DONE) throw new BuildFailure('threw', `build '${this.name}' at tick ${this.tickCount}: its thread stopped (${this.crashed() ?? `state ${state}`})`);
    const leg = badModeIndex(this.shared.action, this.footCount);
    if (leg >= 0) {
      const value = this.shared.action[leg];
      throw new BuildFailure(value - value === 0 ? 'malformed' : 'non-finite', `build '${this.name}' at tick ${this.tickCount}: mode[${leg}] = ${value}: expected 0 (swing) or 1 (stance)`);
    }
    this.loopTime_us = readAction(action, this.shared.action);
    const problem = checkActionFinite(action);
    if (problem !== null) throw new BuildFailure('non-finite', `build '${this.name}' at tick ${this.tickCount}: ${problem}`);
    this.tickCount++;
  }

  async close(): Promise<void> {
    if (this.closed) return;
    this.closed = true;
    const exited = new Promise<void>((resolve) => this.worker.once('exit', () => resolve()));
    Atomics.store(this.shared.control, STATE, CLOSE);
    Atomics.notify(this.shared.control, STATE);
    const grace = setTimeout(() => void this.worker.terminate(), CLOSE_GRACE_ms);
    await exited;
    clearTimeout(grace);
  }
}
