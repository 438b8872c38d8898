// How a build fails a run. A BuildFailure ends that run (an `error` result) and never the suite;
// the episode loop catches it by class. Shared by process builds (bridge.ts) and in-process builds
// (loader.ts, guardController), so the reasons read the same whatever language the build is written in.

export type BuildFailureReason =
  /** A message that is not valid JSON, not the expected type, or the wrong shape/length. */
  | 'malformed'
  /** The build's ready message names a protocol version the harness does not speak. */
  | 'protocol-version'
  /** The program could not be started, exited with a non-zero code or was killed by a signal. */
  | 'crash'
  /** The program exited with code 0 before the harness said bye. */
  | 'exit'
  /** A NaN, ±Infinity or null where the action needs a number. */
  | 'non-finite'
  | 'handshake-timeout'
  | 'tick-timeout'
  /** An in-process build threw (while loading, in its factory, or in tick). */
  | 'threw';

export const BUILD_FAILURE_REASONS: readonly BuildFailureReason[] = [
  'malformed',
  'protocol-version',
  'crash',
  'exit',
  'non-finite',
  'handshake-timeout',
  'tick-timeout',
  'threw',
];

export class BuildFailure extends Error {
  constructor(
    readonly reason: BuildFailureReason,
    /** What happened, in words, naming the build. */
    readonly detail: string,
    /** The last ~2 KB of the program's stderr ('' for in-process builds). */
    readonly stderrTail: string = '',
    options?: { cause?: unknown },
  ) {
    super(`${reason}: ${detail}`, options);
    this.name = 'BuildFailure';
  }
}

/** Keeps the last `capacity_bytes` bytes written to it, without growing. */
export class TailBuffer {
  private readonly buffer: Buffer;
  private length = 0;

  constructor(readonly capacity_bytes: number) {
    this.buffer = Buffer.alloc(capacity_bytes);
  }

  push(chunk: Buffer): void {
    const capacity = this.capacity_bytes;
    if (chunk.length >= capacity) {
      chunk.copy(this.buffer, 0, chunk.length - capacity);
      this.length = capacity;
      return;
    }
    const overflow = this.length + chunk.length - capacity;
    if (overflow > 0) {
      this.buffer.copy(this.buffer, 0, overflow, this.length);
      this.length -= overflow;
    }
    chunk.copy(this.buffer, this.length);
    this.length += chunk.length;
  }

  /** The kept bytes as text; a multi-byte character cut at the start shows as U+FFFD. */
  text(): string {
    return this.buffer.toString('utf8', 0, this.length);
  }
}
