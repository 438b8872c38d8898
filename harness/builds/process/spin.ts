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
 * The back-off, rule 1: misses. A missed spin (the answer came after the window) cost a core for
 * nothing and, on a full machine, may have kept the build from the core it needed. Spins are
 * counted in blocks of SPIN_BLOCK; a block's fourth miss (more than 3 in 128, 2.3 %) pauses the
 * spin for SPIN_BLOCK × 2, × 4 … ticks (up to × 2^MAX_PAUSE_DOUBLINGS), after which a new block
 * tries again; a good block resets the pause. The allowance is the natural tail of a healthy
 * spin: a sleeping Python example answers after more than 100 µs in about 1 % of ticks on the
 * idle VM (its p99 is ~150 µs), and a one-miss allowance left that spin on for only 1 528 of
 * 10 000 ticks; under load misses rise to 11 % (the Python example at load average 2.3), the
 * C++ example's stay at 0.3 %.
 */
const SPIN_BLOCK = 128;
const MISSES_PER_BLOCK = 3;
const MAX_PAUSE_DOUBLINGS = 5;

/**
 * Rule 2: the spin must pay. A spin that is answered can still be slower than not spinning: with
 * both cores busy, a build that does not spin itself wakes faster onto the core a sleeping
 * harness frees than next to a spinning one (the Python example without its own spin, both cores
 * busy: p50 29.6 µs spun against 11.4 µs waited in one round, docs/protocol.md). So after the
 * first good block (and after each pause), PROBE_TICKS ticks wait without spinning, and the
 * median of their loop times is compared with that of the last COMPARED_SPINS spun ticks: unless
 * the spun median is the lower, the spin pauses as after misses (and the first block after the
 * pause is judged again). While it pays, the next probe comes 16, then every 32 good blocks
 * later: on an idle machine a probe tick is a slow one, and probes then stay at 6 in ~4 100
 * ticks (0.15 %, far below the 1 % a p99 reads).
 */
const PROBE_TICKS = 6;
const FIRST_PROBE_EVERY_BLOCKS = 8;
const MAX_PROBE_EVERY_BLOCKS = 32;
const COMPARED_SPINS = 32;

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

type TickKind = 'spun' | 'probe' | 'other';

/** When to spin, from how the last spins went (the two rules above). Allocation-free. */
export class SpinPacing {
  /** Ticks left in a pause; probe ticks left to wait without spinning. */
  private skip = 0;
  private probeLeft = 0;
  private blockSpins = 0;
  private blockMisses = 0;
  /** Pauses since the spin last paid; good blocks since the last probe (primed: probe after the first), and between probes. */
  private pauses = 0;
  private probeEvery = FIRST_PROBE_EVERY_BLOCKS;
  private blocksSinceProbe = FIRST_PROBE_EVERY_BLOCKS - 1;
  private current: TickKind = 'other';
  private readonly spun_us = new Float64Array(COMPARED_SPINS);
  private spunCount = 0;
  private readonly probe_us = new Float64Array(PROBE_TICKS);
  private probeCount = 0;
  private readonly scratch = new Float64Array(COMPARED_SPINS);

  /**
   * Whether this tick may spin; `possible` says whether anything else forbids it (no descriptor,
   * too few cores…), in which case the tick counts for neither rule.
   */
  wanted(possible = true): boolean {
    if (!possible) {
      this.current = 'other';
      return false;
    }
    if (this.probeLeft > 0) {
      this.probeLeft--;
      this.current = 'probe';
      return false;
    }
    if (this.skip > 0) {
      this.skip--;
      this.current = 'other';
      return false;
    }
    this.current = 'spun';
    return true;
  }

  /** Counts one spin: settled during it, or missed (rule 1). */
  record(settled: boolean): void {
    this.blockSpins++;
    if (!settled && ++this.blockMisses > MISSES_PER_BLOCK) {
      this.pause();
    } else if (this.blockSpins === SPIN_BLOCK) {
      this.blockSpins = 0;
      this.blockMisses = 0;
      if (++this.blocksSinceProbe >= this.probeEvery) {
        this.blocksSinceProbe = 0;
        this.probeLeft = PROBE_TICKS;
        this.probeCount = 0;
      }
    }
  }

  /** The loop time of the tick wanted() last decided on, once it is answered (rule 2). */
  answered(loopTime_us: number): void {
    if (this.current === 'spun') {
      this.spun_us[this.spunCount++ % COMPARED_SPINS] = loopTime_us;
    } else if (this.current === 'probe') {
      this.probe_us[this.probeCount++] = loopTime_us;
      if (this.probeCount === PROBE_TICKS) this.judge();
    }
    this.current = 'other';
  }

  private judge(): void {
    const spun = Math.min(this.spunCount, COMPARED_SPINS);
    if (spun > 0 && median(this.spun_us, spun, this.scratch) < median(this.probe_us, PROBE_TICKS, this.scratch)) {
      // The spin pays: pauses start short again, probes come less often.
      this.pauses = 0;
      this.probeEvery = Math.min(2 * this.probeEvery, MAX_PROBE_EVERY_BLOCKS);
    } else {
      this.pause();
    }
  }

  private pause(): void {
    this.pauses++;
    this.skip = SPIN_BLOCK << Math.min(this.pauses, MAX_PAUSE_DOUBLINGS);
    this.blockSpins = 0;
    this.blockMisses = 0;
    this.probeLeft = 0;
    this.spunCount = 0;
    // The first block after the pause is judged at once, and probes come often again.
    this.probeEvery = FIRST_PROBE_EVERY_BLOCKS;
    this.blocksSinceProbe = FIRST_PROBE_EVERY_BLOCKS - 1;
  }
}

/** Median of values[0, count) (insertion sort into scratch: count is at most a few dozen). */
function median(values: Float64Array, count: number, scratch: Float64Array): number {
  for (let i = 0; i < count; i++) {
    const x = values[i];
    let j = i - 1;
    for (; j >= 0 && scratch[j] > x; j--) scratch[j + 1] = scratch[j];
    scratch[j + 1] = x;
  }
  const half = count >> 1;
  return count % 2 === 1 ? scratch[half] : (scratch[half - 1] + scratch[half]) / 2;
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
   * Whether this tick may spin (`possible`: nothing else forbids it): not during a pause or a
   * probe (SpinPacing), so a build slower than the window, or a machine where the spin does not
   * pay, soon waits exactly as without it.
   */
  wanted(possible: boolean): boolean {
    return this.window_ms > 0 && this.pacing.wanted(possible);
  }

  /** Every answered tick's loop time, for the pacing's comparison of spun and waited ticks. */
  answered(loopTime_us: number): void {
    if (this.window_ms > 0) this.pacing.answered(loopTime_us);
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
