// The out-of-process bridge: spawns a build's program (never through a shell), speaks protocol
// version 1 with it in lockstep (docs/protocol.md) and turns every way it can go wrong into a
// BuildFailure. The child runs in its own process group (detached) so that it and anything it
// started can be killed together; no path out of this file leaves a process behind.

import { spawn, type ChildProcessWithoutNullStreams } from 'node:child_process';
import { availableParallelism } from 'node:os';
import type { Action, Controller, ControllerSetup, Observation } from '../interface.js';
import { F64TickChannel, F64_AVAILABLE } from './binary.js';
import type { TickChannel } from './channel.js';
import { JsonTickChannel, decodeReady, encodeHello } from './codec.js';
import { BuildFailure, TailBuffer, type BuildFailureReason } from './failure.js';
import { newlineFraming, type FrameDecoder, type Framing } from './framing.js';
import type { MessageProblem, WireEncoding } from './messages.js';
import { announceGroupGone, announceGroupStarted } from './groups.js';
import { AnswerSpin, SPIN_ENV, stdoutSpinFd, type SpinOutcome } from './spin.js';

export interface ProcessBuildOptions {
  /** Time from spawn to the ready message. */
  handshakeTimeout_ms?: number;
  /** Wall-clock limit of one tick's round trip. */
  tickTimeout_ms?: number;
  /** Time between SIGTERM and SIGKILL to the process group. */
  killGrace_ms?: number;
  /** Time a build has to exit by itself after bye before it is terminated. */
  closeGrace_ms?: number;
  /** How much of the end of stderr a failure reports. */
  stderrTail_bytes?: number;
  /** Longest accepted message. */
  maxFrame_bytes?: number;
  /** Framing of the handshake and of 'json' tick messages. */
  framing?: Framing;
  /** Tick encodings offered in the hello, of which the build picks one (default: all available). */
  encodings?: WireEncoding[];
  /** Added to (and overriding) the harness's environment. */
  env?: Record<string, string>;
  /**
   * Longest busy-wait for an answer after each obs, microseconds (spin.ts), before the event loop
   * waits for it; 0 = never. Only when every spinning side can have a core of its own. Default:
   * the harness's FOOTING_SPIN_US environment variable when set, else PROCESS_BUILD_DEFAULTS.
   */
  spin_us?: number;
}

export const PROCESS_BUILD_DEFAULTS = {
  handshakeTimeout_ms: 5000,
  tickTimeout_ms: 2000,
  killGrace_ms: 200,
  closeGrace_ms: 1000,
  stderrTail_bytes: 2048,
  maxFrame_bytes: 1 << 20,
  // Spin-then-block: spinning about as long as blocking costs is the classic choice, never worse
  // than twice the best in hindsight ("Empirical studies of competitive spinning for a
  // shared-memory multiprocessor", SOSP 1991). Blocking costs the idle VM's wake-ups, 66–85 µs per
  // round trip (docs/protocol.md); 100 µs covers that, and the examples' spun answers (overhead
  // p50 6–12 µs) many times over, while a slower build wastes at most a tenth of a 1 kHz control
  // period per miss before the back-off (spin.ts) stops the spin.
  spin_us: 100,
} as const;

/** Most spin time accepted: ten 1 kHz periods (beyond that a busy-wait is a mistake, not a tuning). */
export const MAX_SPIN_us = 10_000;

export interface ProcessProgram {
  /** Build name, for messages. */
  name: string;
  /** Executable: a path, or a command name looked up on PATH. */
  program: string;
  args: readonly string[];
  cwd: string;
}

type State = 'starting' | 'idle' | 'ticking' | 'closing' | 'failed' | 'closed';

/** Every live child's pid, so the harness can kill their groups when it exits or is interrupted. */
const liveBuilds = new Set<ProcessBuild>();
const FORWARDED_SIGNALS: NodeJS.Signals[] = ['SIGINT', 'SIGTERM', 'SIGHUP'];
/** Cores this process may run on (fixed for its life; read once, it is a system call). */
const CORES = availableParallelism();

/**
 * Spinning takes a core on each side (harness and build): only while every live process build
 * of this thread has two (the suite runner's threads are counted by the suite, suite.ts).
 */
function coresForSpinning(): boolean {
  return spinFitsCores(liveBuilds.size);
}

/** Whether `concurrent` process builds ticking at once may all spin: two cores each. */
export function spinFitsCores(concurrent: number): boolean {
  return concurrent * 2 <= CORES;
}

function killAllGroups(): void {
  for (const build of liveBuilds) build.killGroupNow();
}

function onHarnessSignal(signal: NodeJS.Signals): void {
  killAllGroups();
  removeSignalHandlers();
  // Re-raise so the harness ends the way it would have without us (or other listeners decide).
  if (process.listenerCount(signal) === 0) process.kill(process.pid, signal);
}

function addSignalHandlers(): void {
  for (const signal of FORWARDED_SIGNALS) process.on(signal, onHarnessSignal);
}

function removeSignalHandlers(): void {
  for (const signal of FORWARDED_SIGNALS) process.off(signal, onHarnessSignal);
}

process.on('exit', killAllGroups);

function track(build: ProcessBuild): void {
  if (liveBuilds.size === 0) addSignalHandlers();
  liveBuilds.add(build);
}

function untrack(build: ProcessBuild): void {
  if (liveBuilds.delete(build) && liveBuilds.size === 0) removeSignalHandlers();
}

export class ProcessBuild implements Controller {
  readonly kind = 'process' as const;
  telemetryNames: readonly string[] = [];
  /** What the build said about itself in its ready message ('' when nothing). */
  about = '';
  /** Round trip of the last tick (encode, pipe, build, pipe, decode), microseconds. */
  loopTime_us = Number.NaN;
  /** compute_us the build reported for the last tick, NaN when it reports none. */
  reportedCompute_us = Number.NaN;
  /** Ticks answered so far. */
  tickCount = 0;

  /** Tick encoding the build chose in its ready message. */
  encoding: WireEncoding = 'json';

  /** What the answer spin did so far (observable: a build with spin_us 0 never polls). */
  get spinStats(): Readonly<SpinOutcome> {
    return this.spin.stats;
  }

  private readonly settings: Required<Omit<ProcessBuildOptions, 'env'>>;
  private readonly spin: AnswerSpin;
  private readonly child: ChildProcessWithoutNullStreams;
  /** Reads the handshake (always JSON lines); the tick channel takes over after ready. */
  private readonly decoder: FrameDecoder<string>;
  private channel: TickChannel | null = null;
  private readonly stderrTail: TailBuffer;
  private state: State = 'starting';
  private readonly footCount: number;

  private resolvePending: (() => void) | null = null;
  private rejectPending: ((error: BuildFailure) => void) | null = null;
  private readonly pendingExecutor = (resolve: () => void, reject: (error: BuildFailure) => void): void => {
    this.resolvePending = resolve;
    this.rejectPending = reject;
  };
  private tickStart_ns = 0n;
  private tickTimer: NodeJS.Timeout | null = null;
  private handshakeTimer: NodeJS.Timeout | null = null;
  private closeTimer: NodeJS.Timeout | null = null;
  private killTimer: NodeJS.Timeout | null = null;
  private exitFallbackTimer: NodeJS.Timeout | null = null;

  private terminating = false;
  private gone = false;
  private exitCode: number | null = null;
  private exitSignal: NodeJS.Signals | null = null;
  private readonly goneWaiters: (() => void)[] = [];
  private failure: BuildFailure | null = null;
  private failurePromise: Promise<BuildFailure> | null = null;

  private constructor(
    private readonly program: ProcessProgram,
    setup: ControllerSetup,
    options: ProcessBuildOptions,
  ) {
    this.settings = {
      handshakeTimeout_ms: options.handshakeTimeout_ms ?? PROCESS_BUILD_DEFAULTS.handshakeTimeout_ms,
      tickTimeout_ms: options.tickTimeout_ms ?? PROCESS_BUILD_DEFAULTS.tickTimeout_ms,
      killGrace_ms: options.killGrace_ms ?? PROCESS_BUILD_DEFAULTS.killGrace_ms,
      closeGrace_ms: options.closeGrace_ms ?? PROCESS_BUILD_DEFAULTS.closeGrace_ms,
      stderrTail_bytes: options.stderrTail_bytes ?? PROCESS_BUILD_DEFAULTS.stderrTail_bytes,
      maxFrame_bytes: options.maxFrame_bytes ?? PROCESS_BUILD_DEFAULTS.maxFrame_bytes,
      framing: options.framing ?? newlineFraming,
      encodings: options.encodings ?? (F64_AVAILABLE ? ['json', 'f64'] : ['json']),
      spin_us: options.spin_us ?? spinFromEnvironment(),
    };
    // Never longer than the tick limit: a build that hangs is caught by the tick timer.
    this.spin = new AnswerSpin(Math.min(this.settings.spin_us, this.settings.tickTimeout_ms * 1000));
    this.footCount = setup.robot.hips_m.length;
    this.decoder = this.settings.framing.createDecoder(this.settings.maxFrame_bytes);
    this.stderrTail = new TailBuffer(this.settings.stderrTail_bytes);

    this.child = spawn(program.program, [...program.args], {
      cwd: program.cwd,
      env: this.childEnv(options.env),
      stdio: ['pipe', 'pipe', 'pipe'],
      shell: false,
      detached: true,
      windowsHide: true,
    });
    track(this);
    if (this.child.pid !== undefined) announceGroupStarted(this.child.pid);

    const child = this.child;
    child.on('error', (error: NodeJS.ErrnoException) => {
      if (child.pid === undefined) {
        this.markGone();
        this.fail('crash', `could not start program '${program.program}' (${error.code ?? error.message})`);
      }
    });
    child.on('exit', (code, signal) => {
      this.exitCode = code;
      this.exitSignal = signal;
      if (this.killTimer !== null) clearTimeout(this.killTimer);
      // The leader is gone; whatever it started is still in its group and goes with it.
      this.signalGroup('SIGKILL');
      // 'close' (all pipes drained) normally follows; a grandchild that escaped the group could
      // hold a pipe open, so do not wait for it forever.
      this.exitFallbackTimer = setTimeout(() => this.onGone(), 100);
    });
    child.on('close', () => this.onGone());
    // EPIPE after the child died: the exit path reports the failure.
    child.stdin.on('error', () => {});
    child.stdout.on('data', this.onData);
    child.stderr.on('data', (chunk: Buffer) => this.stderrTail.push(chunk));

    child.stdin.write(this.settings.framing.frame(encodeHello(setup, this.footCount, this.settings.encodings)));
  }

  /** Spawns the program and completes the handshake; rejects with a BuildFailure. */
  static async open(program: ProcessProgram, setup: ControllerSetup, options: ProcessBuildOptions = {}): Promise<ProcessBuild> {
    checkSpin(program.name, options.spin_us);
    spinFromEnvironment(); // a bad FOOTING_SPIN_US is named before anything starts
    let build: ProcessBuild;
    try {
      build = new ProcessBuild(program, setup, options);
    } catch (error) {
      // spawn throws synchronously for arguments it cannot pass at all (a NUL byte, say).
      const why = error instanceof Error ? error.message : String(error);
      throw new BuildFailure('crash', `build '${program.name}': could not start program '${program.program}' (${why})`, '', { cause: error });
    }
    const ready = new Promise<void>(build.pendingExecutor);
    build.handshakeTimer = setTimeout(() => {
      build.fail('handshake-timeout', `no ready message within ${build.settings.handshakeTimeout_ms} ms of starting`);
    }, build.settings.handshakeTimeout_ms);
    try {
      await ready;
    } finally {
      clearTimeout(build.handshakeTimer);
    }
    return build;
  }

  get name(): string {
    return this.program.name;
  }

  get pid(): number | undefined {
    return this.child.pid;
  }

  /**
   * Sends obs and reads the answer into action. Returns undefined when the answer came during the
   * spin (no promise, no event-loop turn), else a promise that settles when it arrived; rejects
   * with the BuildFailure of a misbehaving build either way.
   */
  tick(obs: Observation, action: Action): Promise<void> | undefined {
    if (this.state !== 'idle') {
      if (this.state === 'failed') return this.rejectWithFailure();
      throw new Error(`build '${this.program.name}': tick called while ${this.state} (ticks are lockstep)`);
    }
    this.state = 'ticking';
    this.tickStart_ns = process.hrtime.bigint();
    const channel = this.channel as TickChannel;
    channel.send(this.child.stdin, obs, this.tickCount, action);
    if (this.spinAllowed()) {
      const asked = this.tickCount;
      this.spin.run(this.stdoutFd, channel, this.onAnswer, this.isTicking);
      // The answer came during the spin: this tick is done, even if bytes after it in the same
      // read broke the protocol (that failure is the next tick's, as when the stream reads them).
      if (this.tickCount !== asked) return this.spin.dueForEventLoop() ? new Promise<void>(this.yieldExecutor) : undefined;
      if ((this.state as State) === 'failed') return this.rejectWithFailure(); // a bad answer
    }
    this.spin.fellBack();
    const promise = new Promise<void>(this.pendingExecutor);
    if (this.tickTimer === null) {
      this.tickTimer = setTimeout(this.onTickTimeout, this.settings.tickTimeout_ms);
    } else {
      this.tickTimer.refresh();
    }
    return promise;
  }

  /** Says bye, gives the build closeGrace_ms to exit, then terminates its process group. */
  async close(): Promise<void> {
    if (this.state === 'closed') return;
    if (this.state === 'failed') {
      await this.failurePromise;
      this.state = 'closed';
      return;
    }
    const wasIdle = this.state === 'idle';
    this.state = 'closing';
    this.clearTickTimer();
    if (wasIdle && !this.gone && this.channel !== null) {
      this.channel.sendBye(this.child.stdin);
      this.child.stdin.end();
      this.closeTimer = setTimeout(() => this.terminate(), this.settings.closeGrace_ms);
    } else {
      this.terminate();
    }
    await this.whenGone();
    if (this.closeTimer !== null) clearTimeout(this.closeTimer);
    this.state = 'closed';
  }

  /** Synchronous last resort (harness exit or signal): SIGKILL the whole group. */
  killGroupNow(): void {
    this.signalGroup('SIGKILL');
  }

  /** The parent's end of the child's stdout when it can be polled without blocking, else -1. */
  private stdoutFd = -1;
  private readonly isTicking = (): boolean => this.state === 'ticking';
  private readonly yieldExecutor = (resolve: () => void): void => {
    setImmediate(resolve);
  };

  private spinAllowed(): boolean {
    const possible =
      this.stdoutFd >= 0 &&
      coresForSpinning() &&
      // The obs is still queued in the stream (a full pipe): only the event loop can send it.
      this.child.stdin.writableLength === 0 &&
      // Bytes the stream has already read come before anything read from the descriptor.
      this.child.stdout.readableLength === 0;
    return this.spin.wanted(possible);
  }

  private childEnv(extra: Record<string, string> | undefined): NodeJS.ProcessEnv {
    // The build spins on its side only when the harness would (same core rule, at spawn), unless
    // the spec's environment says otherwise.
    const spin_us = this.settings.spin_us > 0 && spinFitsCores(liveBuilds.size + 1) ? this.settings.spin_us : 0;
    return { ...process.env, [SPIN_ENV]: String(spin_us), ...extra };
  }

  private readonly onData = (chunk: Buffer): void => {
    if (this.channel !== null) {
      this.channel.push(chunk, this.onAnswer);
      return;
    }
    const problem = this.decoder.push(chunk, this.onHandshakeFrame);
    if (problem !== null) this.fail('malformed', problem);
    // Binary frames follow the ready line only as answers; bytes already here were not asked for.
    const channel = this.channel as TickChannel | null; // set by onReady during the push
    if (channel !== null && channel.encoding !== 'json' && this.decoder.pendingBytes() > 0) {
      this.fail('malformed', 'sent bytes after the ready message before any observation');
    }
  };

  private readonly onHandshakeFrame = (frame: string): void => {
    if (this.state === 'starting') this.onReady(frame);
    else if (this.state === 'idle') this.fail('malformed', `sent a message when none was asked (after the handshake): ${frame.slice(0, 120)}`);
  };

  private onReady(frame: string): void {
    const decoded = decodeReady(frame);
    if (!decoded.ok) {
      this.fail(decoded.reason, decoded.detail);
      return;
    }
    const encoding = decoded.message.encoding ?? 'json';
    if (!this.settings.encodings.includes(encoding)) {
      this.fail('malformed', `chose encoding '${encoding}', which the harness did not offer (offered: ${this.settings.encodings.join(', ')})`);
      return;
    }
    this.telemetryNames = Object.freeze([...decoded.message.telemetryNames]);
    this.about = decoded.message.about ?? '';
    this.encoding = encoding;
    const telemetryCount = this.telemetryNames.length;
    this.channel =
      encoding === 'f64'
        ? new F64TickChannel(this.footCount, telemetryCount)
        : new JsonTickChannel(this.footCount, telemetryCount, this.decoder, this.settings.framing.frame);
    if (this.settings.spin_us > 0) this.stdoutFd = stdoutSpinFd(this.child.stdout);
    this.state = 'idle';
    this.settle();
  }

  private readonly onAnswer = (problem: MessageProblem | null): void => {
    if (this.state !== 'ticking' && this.state !== 'idle') return; // after bye or a failure
    if (problem !== null) {
      this.fail(problem.reason, problem.detail);
      return;
    }
    this.loopTime_us = Number(process.hrtime.bigint() - this.tickStart_ns) / 1000;
    this.spin.answered(this.loopTime_us);
    this.reportedCompute_us = (this.channel as TickChannel).reportedCompute_us;
    this.tickCount++;
    this.state = 'idle';
    this.settle();
  };

  private readonly onTickTimeout = (): void => {
    // The one timer is re-armed every tick; firing between ticks means nothing is late.
    if (this.state !== 'ticking') return;
    this.fail('tick-timeout', `tick ${this.tickCount} got no answer within ${this.settings.tickTimeout_ms} ms`);
  };

  private settle(): void {
    const resolve = this.resolvePending;
    this.resolvePending = null;
    this.rejectPending = null;
    resolve?.();
  }

  /** Records the first failure, terminates the group, and rejects once the child is gone. */
  private fail(reason: BuildFailureReason, detail: string): void {
    if (this.state === 'failed' || this.state === 'closed' || this.state === 'closing') return;
    const phase = this.state === 'starting' ? 'during the handshake' : `at tick ${this.tickCount}`;
    this.state = 'failed';
    this.clearTickTimer();
    this.terminate();
    const reject = this.rejectPending;
    this.resolvePending = null;
    this.rejectPending = null;
    this.failurePromise = this.whenGone().then(() => {
      this.failure = new BuildFailure(
        reason,
        `build '${this.program.name}' (${this.program.program}) ${phase}: ${detail}`,
        this.stderrTail.text(),
      );
      return this.failure;
    });
    if (reject !== null) this.failurePromise.then(reject);
  }

  private rejectWithFailure(): Promise<never> {
    return (this.failurePromise as Promise<BuildFailure>).then((failure) => {
      throw failure;
    });
  }

  private onGone(): void {
    if (this.gone) return;
    this.markGone();
    if (this.state === 'closing' || this.state === 'closed' || this.state === 'failed') return;
    const partial = this.channel === null ? this.decoder.pendingBytes() : this.channel.pendingBytes();
    const cut = partial > 0 ? ` (its last ${partial} bytes of output had no newline)` : '';
    if (this.exitSignal !== null) {
      this.fail('crash', `was killed by ${this.exitSignal}${cut}`);
    } else if (this.exitCode !== 0) {
      this.fail('crash', `exited with code ${this.exitCode ?? 'unknown'}${cut}`);
    } else {
      this.fail('exit', `exited (code 0) before the harness said bye${cut}`);
    }
  }

  private markGone(): void {
    if (this.gone) return;
    this.gone = true;
    untrack(this);
    if (this.child.pid !== undefined) announceGroupGone(this.child.pid);
    if (this.killTimer !== null) clearTimeout(this.killTimer);
    if (this.exitFallbackTimer !== null) clearTimeout(this.exitFallbackTimer);
    if (this.closeTimer !== null) clearTimeout(this.closeTimer);
    this.clearTickTimer();
    for (const waiter of this.goneWaiters.splice(0)) waiter();
  }

  private whenGone(): Promise<void> {
    if (this.gone) return Promise.resolve();
    return new Promise((resolve) => this.goneWaiters.push(resolve));
  }

  private terminate(): void {
    if (this.gone || this.terminating) return;
    this.terminating = true;
    this.signalGroup('SIGTERM');
    this.killTimer = setTimeout(() => this.signalGroup('SIGKILL'), this.settings.killGrace_ms);
  }

  private signalGroup(signal: NodeJS.Signals): void {
    const pid = this.child.pid;
    if (pid === undefined) return;
    try {
      // A negative pid addresses the process group the detached child leads.
      process.kill(-pid, signal);
    } catch {
      // ESRCH: the group is already empty.
    }
  }

  private clearTickTimer(): void {
    if (this.tickTimer !== null) {
      clearTimeout(this.tickTimer);
      this.tickTimer = null;
    }
  }
}

/** The harness's own FOOTING_SPIN_US (`FOOTING_SPIN_US=0 footing run …` turns the spin off), else the default. */
function spinFromEnvironment(): number {
  const text = process.env[SPIN_ENV];
  if (text === undefined || text.trim() === '') return PROCESS_BUILD_DEFAULTS.spin_us;
  const value = Number(text);
  if (!Number.isFinite(value) || value < 0 || value > MAX_SPIN_us) {
    throw new RangeError(`environment variable ${SPIN_ENV} = '${text}': expected microseconds from 0 (never spin) to ${MAX_SPIN_us}`);
  }
  return value;
}

function checkSpin(name: string, spin_us: number | undefined): void {
  if (spin_us === undefined) return;
  if (typeof spin_us !== 'number' || !Number.isFinite(spin_us) || spin_us < 0 || spin_us > MAX_SPIN_us) {
    throw new RangeError(`build '${name}': spin_us = ${String(spin_us)}: expected microseconds from 0 (never spin) to ${MAX_SPIN_us}`);
  }
}

export function openProcessBuild(
  program: ProcessProgram,
  setup: ControllerSetup,
  options: ProcessBuildOptions = {},
): Promise<ProcessBuild> {
  return ProcessBuild.open(program, setup, options);
}
