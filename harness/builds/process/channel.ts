// The tick phase of the protocol behind one small interface, so the bridge does not care which
// encoding the build chose in its ready message: JSON lines (codec.ts) or binary frames (binary.ts).

import type { Writable } from 'node:stream';
import type { Action, Observation } from '../interface.js';
import type { MessageProblem, WireEncoding } from './messages.js';

export interface TickChannel {
  readonly encoding: WireEncoding;
  /** compute_us of the last answer, NaN when the build reports none. */
  readonly reportedCompute_us: number;
  /** Writes the obs of `tick`; its answer will be read into `action`. */
  send(stdin: Writable, obs: Observation, tick: number, action: Action): void;
  sendBye(stdin: Writable): void;
  /**
   * Feeds stdout bytes. Calls onAnswer once per complete answer: null when it was read into the
   * action, else what is wrong (including an answer nobody asked for, or a framing error).
   */
  push(chunk: Buffer, onAnswer: (problem: MessageProblem | null) => void): void;
  /** Bytes of an unfinished answer (reported when the build exits mid-message). */
  pendingBytes(): number;
}
