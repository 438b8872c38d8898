// Every way a process build can break the protocol ends its run with the right BuildFailure
// reason, the tail of its stderr, and no process left behind (the child nor its grandchildren).

import { describe, expect, it } from 'vitest';
import { createAction } from '../../../harness/builds/interface.js';
import { BuildFailure, openBuild, type OpenBuildOptions, type OpenedBuild } from '../../../harness/builds/loader.js';
import type { BuildFailureReason } from '../../../harness/builds/process/failure.js';
import { parseBuildSpec } from '../../../harness/builds/spec.js';
import { FIXTURES, REPO_ROOT, isAlive, newObservation, syntheticObservation, testSetup, waitGone } from './helpers.js';

// Short limits keep the suite fast; the defaults (5 s / 2 s) are exercised by the example test.
// The tick limit leaves a hanging fixture time to start its grandchild on a busy 2-core machine.
const LIMITS = { handshakeTimeout_ms: 3000, tickTimeout_ms: 500, killGrace_ms: 100, closeGrace_ms: 300 };

function fixtureSpec(mode: string): string {
  return `bad=exec:python3 ${FIXTURES}misbehaving_build.py ${mode}`;
}

interface Outcome {
  failure: BuildFailure;
  pid: number | undefined;
  ticksDone: number;
}

async function runUntilFailure(specText: string, limits: OpenBuildOptions = {}): Promise<Outcome> {
  const spec = parseBuildSpec(specText, REPO_ROOT);
  let build: OpenedBuild | null = null;
  let ticksDone = 0;
  try {
    build = await openBuild(spec, testSetup(), { ...LIMITS, ...limits });
    const obs = newObservation();
    const action = createAction(4, build.telemetryNames.length);
    for (; ticksDone < 20; ticksDone++) {
      syntheticObservation(obs, ticksDone);
      await build.tick(obs, action);
    }
  } catch (error) {
    if (!(error instanceof BuildFailure)) throw error;
    const pid = build?.pid ?? pidFromStderr(error.stderrTail);
    await build?.close();
    return { failure: error, pid, ticksDone };
  }
  await build?.close();
  throw new Error(`the build '${specText}' did not fail in ${ticksDone} ticks`);
}

function pidFromStderr(tail: string): number | undefined {
  const match = /started, pid (\d+)/.exec(tail);
  return match ? Number(match[1]) : undefined;
}

function grandchildPid(tail: string): number | undefined {
  const match = /grandchild pid (\d+)/.exec(tail);
  return match ? Number(match[1]) : undefined;
}

const cases: { mode: string; reason: BuildFailureReason; detail: RegExp; ticks?: number }[] = [
  { mode: 'crash-handshake', reason: 'crash', detail: /during the handshake: exited with code 1/ },
  { mode: 'exit-handshake', reason: 'exit', detail: /exited \(code 0\) before the harness said bye/ },
  { mode: 'wrong-version', reason: 'protocol-version', detail: /speaks protocol 99; this harness speaks protocol 1/ },
  { mode: 'bad-ready', reason: 'malformed', detail: /ready message field telemetryNames = "not a list": must be array/ },
  { mode: 'crash-tick', reason: 'crash', detail: /at tick 2: exited with code 1/, ticks: 2 },
  { mode: 'exit-tick', reason: 'exit', detail: /at tick 2: exited \(code 0\)/, ticks: 2 },
  { mode: 'malformed', reason: 'malformed', detail: /answer to tick 2 is not valid JSON/, ticks: 2 },
  { mode: 'nan', reason: 'non-finite', detail: /contains NaN or Infinity/, ticks: 2 },
  { mode: 'null', reason: 'non-finite', detail: /field footTarget_m\[2\] = null: must be number/, ticks: 2 },
  { mode: 'short', reason: 'malformed', detail: /field groundForce_N = .*must NOT have fewer than 12 items/, ticks: 2 },
  // The extra answer lands either between ticks or as the reply to the next one; both are caught.
  {
    mode: 'chatty',
    reason: 'malformed',
    detail: /sent a message when none was asked|answered tick 2 when tick 3 was asked/,
    ticks: 3,
  },
  { mode: 'f64-nan', reason: 'non-finite', detail: /groundForce_N\[4\] = NaN/, ticks: 2 },
  { mode: 'f64-mode', reason: 'malformed', detail: /mode\[1\] = 0.5: expected 0 \(swing\) or 1 \(stance\)/, ticks: 2 },
  { mode: 'f64-tag', reason: 'malformed', detail: /an f64 frame must start with FOOTACT1, got "HELLO!!\\n"/, ticks: 2 },
  { mode: 'f64-truncated', reason: 'exit', detail: /exited \(code 0\) before the harness said bye \(its last 40 bytes of output/, ticks: 2 },
];

describe('process build failures', () => {
  for (const { mode, reason, detail, ticks } of cases) {
    it(`a build in mode ${mode} fails the run with reason '${reason}' and leaves no process`, async () => {
      const { failure, pid, ticksDone } = await runUntilFailure(fixtureSpec(mode));
      expect(failure.reason).toBe(reason);
      expect(failure.message).toMatch(detail);
      expect(failure.message).toContain("build 'bad'");
      expect(failure.stderrTail).toContain(`misbehaving_build[${mode}]: started`);
      if (ticks !== undefined) expect(ticksDone).toBe(ticks);
      expect(pid).toBeTypeOf('number');
      expect(isAlive(pid as number)).toBe(false);
    });
  }

  it('a crash reports the Python traceback in the stderr tail', async () => {
    const { failure } = await runUntilFailure(fixtureSpec('crash-tick'));
    expect(failure.stderrTail).toContain('RuntimeError: deliberate crash at tick 2');
  });

  it('a build that never answers the hello fails with handshake-timeout and its grandchild is killed too', async () => {
    // Long enough for Python to start and spawn the grandchild under load (~0.2 s when idle).
    const { failure, pid } = await runUntilFailure(fixtureSpec('hang-handshake'), { handshakeTimeout_ms: 1000 });
    expect(failure.reason).toBe('handshake-timeout');
    expect(failure.message).toMatch(/no ready message within 1000 ms/);
    const grandchild = grandchildPid(failure.stderrTail);
    expect(grandchild).toBeTypeOf('number');
    expect(isAlive(pid as number)).toBe(false);
    expect(await waitGone(grandchild as number)).toBe(true);
  });

  it('a build that hangs mid-run fails with tick-timeout and its process group is killed', async () => {
    const { failure, pid, ticksDone } = await runUntilFailure(fixtureSpec('hang-tick'));
    expect(failure.reason).toBe('tick-timeout');
    expect(failure.message).toMatch(/tick 2 got no answer within 500 ms/);
    expect(ticksDone).toBe(2);
    const grandchild = grandchildPid(failure.stderrTail);
    expect(grandchild).toBeTypeOf('number');
    expect(isAlive(pid as number)).toBe(false);
    expect(await waitGone(grandchild as number)).toBe(true);
  });

  it('a hung build that ignores SIGTERM is killed with SIGKILL after the grace period', async () => {
    const { failure, pid } = await runUntilFailure(fixtureSpec('hang-tick-stubborn'));
    expect(failure.reason).toBe('tick-timeout');
    expect(failure.stderrTail).toContain('ignoring SIGTERM');
    expect(isAlive(pid as number)).toBe(false);
    expect(await waitGone(grandchildPid(failure.stderrTail) as number)).toBe(true);
  });

  it('a program that does not exist fails the run with crash, naming the program', async () => {
    const { failure } = await runUntilFailure('ghost=exec:./no/such/program --flag');
    expect(failure.reason).toBe('crash');
    expect(failure.message).toMatch(/could not start program '.*no\/such\/program' \(ENOENT\)/);
  });

  it('a build that picks an encoding the harness did not offer fails as malformed', async () => {
    const { failure } = await runUntilFailure(fixtureSpec('f64-good'), { encodings: ['json'] });
    expect(failure.reason).toBe('malformed');
    expect(failure.message).toMatch(/chose encoding 'f64', which the harness did not offer \(offered: json\)/);
  });

  it('a program name spawn cannot even pass fails the run with crash instead of throwing', async () => {
    const { failure } = await runUntilFailure('nul=exec:./bad\u0000name');
    expect(failure.reason).toBe('crash');
    expect(failure.message).toMatch(/could not start program .*without null bytes/);
  });

  it('after one build failed, the next build runs normally', async () => {
    await runUntilFailure(fixtureSpec('crash-tick'));
    const build = await openBuild(parseBuildSpec(fixtureSpec('good'), REPO_ROOT), testSetup(), LIMITS);
    const obs = newObservation();
    const action = createAction(4, 0);
    for (let k = 0; k < 5; k++) {
      syntheticObservation(obs, k);
      await build.tick(obs, action);
    }
    expect(action.stiffness_N_per_m[3]).toBe(100);
    const pid = build.pid as number;
    await build.close();
    expect(isAlive(pid)).toBe(false);
  });

  it('a tick after a failure rejects with the same failure', async () => {
    const spec = parseBuildSpec(fixtureSpec('exit-tick'), REPO_ROOT);
    const build = await openBuild(spec, testSetup(), LIMITS);
    const obs = newObservation();
    const action = createAction(4, 0);
    await build.tick(obs, action);
    await build.tick(obs, action);
    const first = await Promise.resolve(build.tick(obs, action)).catch((error: unknown) => error);
    const second = await Promise.resolve(build.tick(obs, action)).catch((error: unknown) => error);
    expect(first).toBeInstanceOf(BuildFailure);
    expect(second).toBe(first);
    await build.close();
  });
});
