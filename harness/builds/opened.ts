// What an opened build looks like to the harness (whatever its kind), and the allocation-free
// finite check every tick's action passes. Apart from loader.ts so the isolated-thread opener can
// use both without importing the loader that imports it.

import type { Action, Controller, Observation } from './interface.js';
import type { BuildKind } from './spec.js';
import type { WireEncoding } from './process/messages.js';

export interface OpenedBuild extends Controller {
  readonly name: string;
  readonly kind: BuildKind;
  readonly telemetryNames: readonly string[];
  /**
   * Wall time of the last tick, microseconds: the tick call itself for in-process builds, the
   * round trip (encode, pipes, build, decode) for process builds. High-resolution clock.
   */
  readonly loopTime_us: number;
  /** Compute time the build reported for its last tick (process builds), else NaN. */
  readonly reportedCompute_us: number;
  /** What a process build said about itself in its ready message; '' otherwise. */
  readonly about: string;
  /** The child's pid (process builds). */
  readonly pid?: number;
  /** Tick encoding the process build chose (process builds). */
  readonly encoding?: WireEncoding;
  /**
   * Rejects/throws a BuildFailure when the build misbehaves; returns a promise for process builds
   * whose answer was not there by the end of their answer spin (process/spin.ts).
   */
  tick(obs: Observation, action: Action): void | Promise<void>;
  close(): Promise<void>;
}

/**
 * Names the first non-finite number in an action ("groundForce_N[4] = NaN"), or null. Cheap and
 * allocation-free on the healthy path, so the episode loop may call it every tick for any build.
 * Telemetry is checked too: a process build cannot send NaN, so an in-process one may not either.
 */
export function checkActionFinite(action: Action): string | null {
  if (allFinite(action)) return null;
  let index = firstNonFinite(action.groundForce_N);
  if (index >= 0) return describe('groundForce_N', index, action.groundForce_N[index]);
  index = firstNonFinite(action.footTarget_m);
  if (index >= 0) return describe('footTarget_m', index, action.footTarget_m[index]);
  index = firstNonFinite(action.footTargetVelocity_mps);
  if (index >= 0) return describe('footTargetVelocity_mps', index, action.footTargetVelocity_mps[index]);
  index = firstNonFinite(action.stiffness_N_per_m);
  if (index >= 0) return describe('stiffness_N_per_m', index, action.stiffness_N_per_m[index]);
  index = firstNonFinite(action.damping_Ns_per_m);
  if (index >= 0) return describe('damping_Ns_per_m', index, action.damping_Ns_per_m[index]);
  index = firstNonFinite(action.telemetry);
  if (index >= 0) return describe('telemetry', index, action.telemetry[index]);
  return null;
}

/**
 * The healthy path in one pass without a branch per value: x − x is 0 for every finite x and NaN
 * for NaN and ±Infinity, and a NaN term makes the whole sum NaN (IEEE 754).
 */
function allFinite(action: Action): boolean {
  let sum = 0;
  const a = action.groundForce_N;
  const b = action.footTarget_m;
  const c = action.footTargetVelocity_mps;
  for (let j = 0; j < a.length; j++) sum += a[j] - a[j];
  for (let j = 0; j < b.length; j++) sum += b[j] - b[j];
  for (let j = 0; j < c.length; j++) sum += c[j] - c[j];
  const d = action.stiffness_N_per_m;
  const e = action.damping_Ns_per_m;
  for (let i = 0; i < d.length; i++) sum += d[i] - d[i];
  for (let i = 0; i < e.length; i++) sum += e[i] - e[i];
  const t = action.telemetry;
  for (let k = 0; k < t.length; k++) sum += t[k] - t[k];
  return sum === 0;
}

function firstNonFinite(values: Float64Array): number {
  for (let i = 0; i < values.length; i++) {
    const x = values[i];
    // x − x is 0 for every finite x and NaN for NaN and ±Infinity.
    if (x - x !== 0) return i;
  }
  return -1;
}

function describe(field: string, index: number, value: number): string {
  return `${field}[${index}] = ${value}`;
}

/**
 * The build as it is, except that `beforeTick(obs)` sees each observation just before the build
 * does (outside the build's own loop-time measurement). For the harness's recorders of
 * observations; every other member passes through.
 */
export function withTickTap(build: OpenedBuild, beforeTick: (obs: Observation) => void): OpenedBuild {
  return {
    get name() {
      return build.name;
    },
    get kind() {
      return build.kind;
    },
    get telemetryNames() {
      return build.telemetryNames;
    },
    get loopTime_us() {
      return build.loopTime_us;
    },
    get reportedCompute_us() {
      return build.reportedCompute_us;
    },
    get about() {
      return build.about;
    },
    get pid() {
      return build.pid;
    },
    get encoding() {
      return build.encoding;
    },
    tick(obs: Observation, action: Action) {
      beforeTick(obs);
      return build.tick(obs, action);
    },
    close: () => build.close(),
  };
}
