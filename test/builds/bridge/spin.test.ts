// The answer spin (harness/builds/process/spin.ts) changes how long the harness waits, never what
// it reads: an answer read during the spin and one read by the stream after it give the same
// actions and tick counts, a build that breaks during the spin fails exactly as without it, and
// spin_us 0 never polls. No timing is asserted: sleeps only force the fallback path.

import { afterEach, describe, expect, it, vi } from 'vitest';
import { createAction, type Action } from '../../../harness/builds/interface.js';
import { BuildFailure, openBuild, type OpenBuildOptions } from '../../../harness/builds/loader.js';
import { ProcessBuild, spinFitsCores } from '../../../harness/builds/process/bridge.js';
import { AnswerSpin, SpinPacing } from '../../../harness/builds/process/spin.js';
import { parseBuildSpec } from '../../../harness/builds/spec.js';
import { FIXTURES, REPO_ROOT, newObservation, syntheticActions, syntheticObservation, testSetup } from './helpers.js';

const TICKS = 40;
/** Longer than any spin window below by far: a sleeping tick is always answered after the spin. */
const SLEEP_ms = 50;
/** The longest window accepted (MAX_SPIN_us): on a loaded machine the fast answers still come within it. */
const WIDE_SPIN_us = 10_000;
const LIMITS = { handshakeTimeout_ms: 3000, tickTimeout_ms: 500, killGrace_ms: 100, closeGrace_ms: 300 };
// Spinning needs two cores per live build; on a 1-core machine the spin never engages.
const canSpin = spinFitsCores(1);

function sleepySpec(every: number, encoding: 'f64' | 'json'): string {
  return `sleepy=exec:python3 ${FIXTURES}sleepy_build.py ${every} ${SLEEP_ms} ${encoding}`;
}

interface Recorded {
  actions: Action[];
  tickCount: number;
  polls: number;
  answered: number;
  missed: number;
  about: string;
}

async function record(specText: string, options: OpenBuildOptions): Promise<Recorded> {
  const build = await openBuild(parseBuildSpec(specText, REPO_ROOT), testSetup(), { ...LIMITS, ...options });
  expect(build).toBeInstanceOf(ProcessBuild);
  const process = build as ProcessBuild;
  try {
    const actions = await syntheticActions(build, TICKS);
    return { actions, tickCount: process.tickCount, ...process.spinStats, about: build.about };
  } finally {
    await build.close();
  }
}

describe('the answer spin', () => {
  for (const encoding of ['f64', 'json'] as const) {
    it.runIf(canSpin)(`gives the same actions and tick counts as waiting in the event loop (${encoding}, a build that sleeps past the window every 7th tick)`, async () => {
      const waited = await record(sleepySpec(7, encoding), { spin_us: 0 });
      const spun = await record(sleepySpec(7, encoding), { spin_us: WIDE_SPIN_us });
      expect(spun.tickCount).toBe(TICKS);
      expect(waited.tickCount).toBe(TICKS);
      for (let k = 0; k < TICKS; k++) expect(spun.actions[k]).toEqual(waited.actions[k]);
      // Both paths ran: the sleeping ticks (tick % 7 = 3) can only be answered after the spin.
      expect(spun.answered).toBeGreaterThan(0);
      expect(spun.missed).toBeGreaterThan(0);
      expect(spun.answered + spun.missed).toBeLessThanOrEqual(TICKS);
    });
  }

  it('with spin_us 0 never polls, and tells the build not to spin either', async () => {
    const waited = await record(sleepySpec(0, 'f64'), { spin_us: 0 });
    expect(waited.tickCount).toBe(TICKS);
    expect(waited).toMatchObject({ polls: 0, answered: 0, missed: 0 });
    expect(waited.about).toBe('FOOTING_SPIN_US=0');
  });

  it.runIf(canSpin)('tells the build the window it spins with itself, unless the spec environment overrides it', async () => {
    expect((await record(sleepySpec(0, 'f64'), { spin_us: 250 })).about).toBe('FOOTING_SPIN_US=250');
    expect((await record(sleepySpec(0, 'f64'), { spin_us: 250, env: { FOOTING_SPIN_US: '0' } })).about).toBe('FOOTING_SPIN_US=0');
  });

  it("takes its default from the harness's FOOTING_SPIN_US, and names a bad one", async () => {
    const saved = process.env.FOOTING_SPIN_US;
    try {
      process.env.FOOTING_SPIN_US = '0';
      const waited = await record(sleepySpec(0, 'f64'), {});
      expect(waited).toMatchObject({ polls: 0, about: 'FOOTING_SPIN_US=0' });
      process.env.FOOTING_SPIN_US = 'fast';
      await expect(openBuild(parseBuildSpec(sleepySpec(0, 'f64'), REPO_ROOT), testSetup(), {})).rejects.toThrow(
        "environment variable FOOTING_SPIN_US = 'fast': expected microseconds from 0 (never spin) to 10000",
      );
    } finally {
      if (saved === undefined) delete process.env.FOOTING_SPIN_US;
      else process.env.FOOTING_SPIN_US = saved;
    }
  });

  it('rejects a spin_us that is not 0 to 10000 µs, naming the build and the value', async () => {
    for (const spin_us of [-1, Number.NaN, 20_000]) {
      await expect(openBuild(parseBuildSpec(sleepySpec(0, 'f64'), REPO_ROOT), testSetup(), { spin_us })).rejects.toThrow(
        new RegExp(`build 'sleepy': spin_us = ${spin_us}: expected microseconds from 0 \\(never spin\\) to 10000`),
      );
    }
  });

  it.runIf(canSpin)('lets the event loop run while every answer comes during the spin', async () => {
    const build = (await openBuild(parseBuildSpec(sleepySpec(0, 'f64'), REPO_ROOT), testSetup(), { ...LIMITS, spin_us: WIDE_SPIN_us })) as ProcessBuild;
    const obs = newObservation();
    const action = createAction(4, build.telemetryNames.length);
    let turned = false;
    setImmediate(() => (turned = true));
    let k = 0;
    try {
      // Without the periodic turn (spin.ts, every 10 ms) a spun tick never yields to the loop.
      for (; !turned && k < 200_000; k++) {
        const pending = build.tick(obs, action);
        if (pending !== undefined) await pending;
      }
    } finally {
      await build.close();
    }
    expect(turned).toBe(true);
    expect(build.tickCount).toBe(k);
  });

  afterEach(() => {
    vi.restoreAllMocks();
  });

  it('gives the event loop a turn once 10 ms have passed since its last one, then waits another 10 ms', () => {
    let now_ms = 1000;
    vi.spyOn(performance, 'now').mockImplementation(() => now_ms);
    const spin = new AnswerSpin(100);
    spin.fellBack();
    now_ms += 9.9;
    expect(spin.dueForEventLoop()).toBe(false);
    now_ms += 0.2;
    expect(spin.dueForEventLoop()).toBe(true);
    expect(spin.dueForEventLoop()).toBe(false);
    now_ms += 5;
    spin.fellBack();
    now_ms += 9;
    expect(spin.dueForEventLoop()).toBe(false);
  });

  /** Drives a pacing: spun ticks take spun_us, waited ones waited_us; miss(k) says which spins miss. */
  function drive(pacing: SpinPacing, ticks: number, spun_us: number, waited_us: number, miss: (spin: number) => boolean = () => false) {
    const runs: number[] = []; // lengths of the runs of ticks without a spin
    let spins = 0;
    let waiting = 0;
    for (let k = 0; k < ticks; k++) {
      if (pacing.wanted()) {
        if (waiting > 0) runs.push(waiting);
        waiting = 0;
        pacing.record(!miss(spins++));
        pacing.answered(spun_us);
      } else {
        waiting++;
        pacing.answered(waited_us);
      }
    }
    if (waiting > 0) runs.push(waiting);
    return { spins, runs };
  }

  it('keeps spinning while it pays and misses stay at three per 128 spins, probing 6 waited ticks after blocks 1, 17, 49, 81 …', () => {
    const { spins, runs } = drive(new SpinPacing(), 81 * 128 + 4 * 6, 10, 80, (k) => [5, 50, 127].includes(k % 128));
    expect(spins).toBe(81 * 128);
    expect(runs).toEqual([6, 6, 6, 6]);
  });

  it('pauses at the fourth miss in a block, for 256, 512 … 4096 ticks, and starts short again once the spin pays', () => {
    const pacing = new SpinPacing();
    // Every spin misses: each pause follows the four misses that start the block.
    const { runs } = drive(pacing, 4 + 256 + 4 + 512 + 4 + 1024 + 4 + 2048 + 4 + 4096 + 4 + 4096 + 4 + 4096, 10, 80, () => true);
    expect(runs).toEqual([256, 512, 1024, 2048, 4096, 4096, 4096]);
    // A block that pays (fast spins, three misses) and its probe reset the pause to its shortest.
    const good = drive(pacing, 128 + 6, 10, 80, (k) => k < 3);
    expect(good.runs).toEqual([6]);
    expect(drive(pacing, 4 + 256 + 1, 10, 80, () => true).runs).toEqual([256]);
  });

  it('pauses a spin that is answered but slower than waiting (the probe of 6 waited ticks wins)', () => {
    // No miss at all, but spun ticks take 30 µs and waited ones 8 µs: after each block and its
    // probe, a pause of 256, then 512 … ticks.
    const { runs } = drive(new SpinPacing(), 128 + 6 + 256 + 128 + 6 + 512 + 128 + 6 + 1024 + 1, 30, 8);
    expect(runs).toEqual([6 + 256, 6 + 512, 6 + 1024]);
  });

  it('never wants to spin with a window of 0', () => {
    const spin = new AnswerSpin(0);
    for (let k = 0; k < 3; k++) expect(spin.wanted(true)).toBe(false);
  });

  // Each mode breaks at tick 2, while the harness spins (or waits) for that answer.
  // chatty: two answers to tick 2 (usually in one read): tick 2 succeeds, the next tick fails.
  const modes = ['crash-tick', 'exit-tick', 'malformed', 'nan', 'short', 'chatty', 'hang-tick', 'f64-nan', 'f64-tag', 'f64-truncated'];
  for (const mode of modes) {
    it.runIf(canSpin)(`a build in mode ${mode} fails with the same reason and message whether the harness spins or not`, async () => {
      const spec = `bad=exec:python3 ${FIXTURES}misbehaving_build.py ${mode}`;
      const waited = await failureOf(spec, { spin_us: 0 });
      const spun = await failureOf(spec, { spin_us: WIDE_SPIN_us });
      expect(spun.ticksDone).toBe(waited.ticksDone);
      expect(spun.failure.reason).toBe(waited.failure.reason);
      // The message names the program and the tick; the pid is in the stderr tail only. Two
      // answers to one tick read as one chunk or as two give one of two messages, either way.
      if (mode === 'chatty') expect(spun.failure.message).toMatch(/sent a message when none was asked|answered tick 2 when tick 3 was asked/);
      else expect(spun.failure.message).toBe(waited.failure.message);
    });
  }
});

async function failureOf(specText: string, options: OpenBuildOptions): Promise<{ failure: BuildFailure; ticksDone: number }> {
  const build = await openBuild(parseBuildSpec(specText, REPO_ROOT), testSetup(), { ...LIMITS, ...options });
  const obs = newObservation();
  const action = createAction(4, build.telemetryNames.length);
  let ticksDone = 0;
  try {
    for (; ticksDone < 20; ticksDone++) {
      syntheticObservation(obs, ticksDone);
      const pending = build.tick(obs, action);
      if (pending !== undefined) await pending;
    }
  } catch (error) {
    if (!(error instanceof BuildFailure)) throw error;
    return { failure: error, ticksDone };
  } finally {
    await build.close();
  }
  throw new Error(`'${specText}' did not fail in ${ticksDone} ticks`);
}
