// The answer spin: after sending an obs, the bridge may busy-poll the build's stdout for a short
// window instead of sleeping in the event loop. On an idle machine each side of the lockstep pipe
// otherwise sleeps and an idle core takes tens of µs to wake (docs/protocol.md, "Latency on idle
// machines"); polling keeps the harness's core awake. The bytes read go through the same
// channel.push as the stream's 'data' events, and since the event loop does not run during the
// spin, the stream (the fallback) still sees every later byte in order.

import { readFileSync, readSync } from 'node:fs';
import type { Readable } from 'node:stream';
import type { TickChannel } from './channel.js';
import type { MessageProblem } from './messages.js';

/** The child's environment variable that tells a build how long to spin on its side (µs; 0 = never). */
export const SPIN_ENV = 'FOOTING_SPIN_US';

export interface SpinOutcome {
  /** Reads tried on the descriptor (each empty one is an EAGAIN). */
  polls: number;
  /** Ticks settled during the spin (answered, or failed on a bad answer). */
  answered: number;
  /** Spins that ended without the answer (window over, end of file, a read error). */
  missed: number;
}

/**
 * However long answers keep coming during spins, the event loop gets a turn at least this often
 * (a spun tick returns no promise, so nothing else would run it): the child's stderr is drained
 * (a 64 KiB pipe fills only above 6 MB/s of logging), signals and thread messages are served
 * well within a person's notice (~0.1 s, common practice for interactive response).
 */
const EVENT_LOOP_EVERY_ms = 10;

/**
 * The back-off. A missed spin (the answer came after the window) cost a core for nothing and, on
 * a full machine, may have kept the build from the core it needed, so its tick can end later than
 * without the spin. Misses are therefore kept under 1 % of ticks, the tail a p99 reads: spins are
 * counted in blocks of SPIN_BLOCK, and a block's second miss (1 in 128, 0.8 %) pauses the spin for
 * SPIN_BLOCK × 2, × 4 … ticks (up to × MAX_PAUSE_DOUBLINGS), after which a new block probes again;
 * a block with at most one miss resets the pause. The C++ example missed 53–65 of ~20 000 spins
 * on the VM at load average 2.3 (0.3 %); the Python one 11 % at the same load, so its spin soon
 * stays off there (docs/protocol.md, "Latency on idle machines").
 */
const SPIN_BLOCK = 128;
const MISSES_PER_BLOCK = 1;
const MAX_PAUSE_DOUBLINGS = 5;

/** One read takes whatever the pipe holds; 64 KiB is a Linux pipe's default capacity (pipe(7)). */
const READ_BYTES = 64 * 1024;

/** O_NONBLOCK in the octal flags of /proc/self/fdinfo: asm-generic/fcntl.h (x86, ARM, RISC-V, POWER, s390). */
const O_NONBLOCK = 0o4000;
const GENERIC_FLAG_ARCHES = new Set(['x64', 'ia32', 'arm', 'arm64', 'riscv64', 'ppc64', 's390x', 'loong64']);

/**
 * The parent's end of a child's stdout when a read on it cannot block (libuv opens it with
 * O_NONBLOCK), else -1 (no spin). Checked in /proc rather than assumed: a blocking read there
 * would stop the harness with no timer to end it.
 */
export function stdoutSpinFd(stdout: Readable): number {
  // The descriptor of the stream's pipe handle (not public API; absent ⇒ no spin).
  const fd = (stdout as unknown as { _handle?: { fd?: unknown } })._handle?.fd;
  if (typeof fd !== 'number' || fd < 0) return -1;
  return isNonBlocking(fd) ? fd : -1;
}

function isNonBlocking(fd: number): boolean {
  if (process.platform !== 'linux' || !GENERIC_FLAG_ARCHES.has(process.arch)) return false;
  try {
    const match = /^flags:\s*([0-7]+)$/m.exec(readFileSync(`/proc/self/fdinfo/${fd}`, 'latin1'));
    return match !== null && (Number.parseInt(match[1], 8) & O_NONBLOCK) !== 0;
  } catch {
    return false;
  }
}

/** When to spin, from how the last spins went (the back-off above). */
export class SpinPacing {
  /** Ticks left without a spin; spins and misses in the current block; pauses since a good block. */
  private skip = 0;
  private blockSpins = 0;
  private blockMisses = 0;
  private pauses = 0;

  /** Whether this tick may spin (false during a pause, which it counts down). */
  wanted(): boolean {
    if (this.skip > 0) {
      this.skip--;
      return false;
    }
    return true;
  }

  /** Counts one spin: settled during it, or missed. */
  record(settled: boolean): void {
    this.blockSpins++;
    if (!settled && ++this.blockMisses > MISSES_PER_BLOCK) {
      this.pauses++;
      this.skip = SPIN_BLOCK << Math.min(this.pauses, MAX_PAUSE_DOUBLINGS);
      this.blockSpins = 0;
      this.blockMisses = 0;
    } else if (this.blockSpins === SPIN_BLOCK) {
      this.pauses = 0;
      this.blockSpins = 0;
      this.blockMisses = 0;
    }
  }
}

export class AnswerSpin {
  readonly stats: SpinOutcome = { polls: 0, answered: 0, missed: 0 };
  private readonly window_ms: number;
  private readonly buffer: Buffer;
  private readonly pacing = new SpinPacing();
  private lastTurn_ms = performance.now();

  constructor(window_us: number) {
    this.window_ms = window_us / 1000;
    this.buffer = Buffer.allocUnsafe(window_us > 0 ? READ_BYTES : 0);
  }

  /**
   * Whether this tick may spin: not during a pause (SPIN_BLOCK above), so a build slower than the
   * window, or a machine too busy to run both sides at once, soon waits exactly as without it.
   */
  wanted(): boolean {
    return this.window_ms > 0 && this.pacing.wanted();
  }

  /**
   * Polls fd until the tick settles (stillWaiting() false) or the window ends. End of file and
   * errors other than EAGAIN end the spin and are left to the stream's own handlers.
   */
  run(fd: number, channel: TickChannel, onAnswer: (problem: MessageProblem | null) => void, stillWaiting: () => boolean): void {
    const limit = Error.stackTraceLimit;
    // An empty poll throws EAGAIN; without a stack trace that costs ~2 µs instead of ~4 (measured
    // on the 2-core VM, Node 20).
    Error.stackTraceLimit = 0;
    const deadline_ms = performance.now() + this.window_ms;
    let settled = false;
    try {
      for (;;) {
        this.stats.polls++;
        let got: number;
        try {
          got = readSync(fd, this.buffer, 0, READ_BYTES, null);
        } catch (error) {
          const code = (error as NodeJS.ErrnoException).code;
          if ((code === 'EAGAIN' || code === 'EWOULDBLOCK') && performance.now() < deadline_ms) continue;
          break;
        }
        if (got === 0) break;
        // push copies what it keeps of an unfinished message, so the buffer is reused safely.
        channel.push(this.buffer.subarray(0, got), onAnswer);
        if (!stillWaiting()) {
          settled = true;
          break;
        }
      }
    } finally {
      Error.stackTraceLimit = limit;
    }
    if (settled) this.stats.answered++;
    else this.stats.missed++;
    this.pacing.record(settled);
  }

  /** The tick waits in the event loop (no spin, or a miss): the loop gets its turn. */
  fellBack(): void {
    this.lastTurn_ms = performance.now();
  }

  /** True (once per EVENT_LOOP_EVERY_ms) when spun ticks have kept the event loop from running. */
  dueForEventLoop(): boolean {
    const now_ms = performance.now();
    if (now_ms - this.lastTurn_ms < EVENT_LOOP_EVERY_ms) return false;
    this.lastTurn_ms = now_ms;
    return true;
  }
}
