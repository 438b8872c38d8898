// The JSON codec of protocol version 1: what each message says. Framing (framing.ts) is separate.
//
// Numbers go out in JavaScript's shortest round-trip form (ECMA-262 Number::toString), which any
// correctly rounding parser (Python's float(), C's strtod) reads back to the same double, so the
// protocol itself adds no error. −0 is written as -0.0 so that parsers that would read "-0" as the
// integer 0 keep the sign.

import type { Writable } from 'node:stream';
import type { Action, ControllerSetup, Observation } from '../interface.js';
import type { TickChannel } from './channel.js';
import type { FrameDecoder } from './framing.js';
import {
  PROTOCOL_VERSION,
  describeSchemaError,
  shortJson,
  validateAct,
  validateReady,
  type ActMessage,
  type MessageProblem,
  type ReadyMessage,
  type WireEncoding,
} from './messages.js';

export function encodeHello(setup: ControllerSetup, footCount: number, encodings: readonly WireEncoding[]): string {
  return JSON.stringify({
    type: 'hello',
    protocol: PROTOCOL_VERSION,
    robot: setup.robot,
    controlRate_Hz: setup.controlRate_Hz,
    physicsStep_s: setup.physicsStep_s,
    gravity_mps2: setup.gravity_mps2,
    footCount,
    options: setup.options,
    encodings,
  });
}

export const BYE_MESSAGE = '{"type":"bye"}';

function formatNumber(x: number): string {
  if (x === 0) return 1 / x < 0 ? '-0.0' : '0';
  // The plant never hands a controller a non-finite observation (it stops the run first); null
  // keeps the line valid JSON should that ever change.
  return x - x === 0 ? String(x) : 'null';
}

function appendNumbers(text: string, values: ArrayLike<number>): string {
  const n = values.length;
  if (n === 0) return text + '[]';
  text += '[' + formatNumber(values[0]);
  for (let i = 1; i < n; i++) text += ',' + formatNumber(values[i]);
  return text + ']';
}

function appendIntegers(text: string, values: Uint8Array): string {
  const n = values.length;
  if (n === 0) return text + '[]';
  text += '[' + values[0];
  for (let i = 1; i < n; i++) text += ',' + values[i];
  return text + ']';
}

/** JSON string with every non-ASCII character \u-escaped, so the whole obs line stays ASCII. */
function asciiJsonString(text: string): string {
  return JSON.stringify(text).replace(/[\u0080-\uffff]/g, (c) => '\\u' + c.charCodeAt(0).toString(16).padStart(4, '0'));
}

const QUOTED_GAITS: Record<string, string> = { stand: '"stand"', trot: '"trot"' };

/** One obs message; the field names are the Observation's (interface.ts), arrays flat. */
export function encodeObservation(obs: Observation, tick: number): string {
  let s = '{"type":"obs","tick":' + tick + ',"time_s":' + formatNumber(obs.time_s);
  s = appendNumbers(s + ',"trunkPosition_m":', obs.trunkPosition_m);
  s = appendNumbers(s + ',"trunkQuaternion":', obs.trunkQuaternion);
  s = appendNumbers(s + ',"trunkVelocity_mps":', obs.trunkVelocity_mps);
  s = appendNumbers(s + ',"trunkAngularVelocity_radps":', obs.trunkAngularVelocity_radps);
  s = appendNumbers(s + ',"footPosition_m":', obs.footPosition_m);
  s = appendNumbers(s + ',"footVelocity_mps":', obs.footVelocity_mps);
  s = appendNumbers(s + ',"footForce_N":', obs.footForce_N);
  s = appendIntegers(s + ',"footContact":', obs.footContact);
  s = appendNumbers(s + ',"frictionEstimate":', obs.frictionEstimate);
  const command = obs.command;
  s += ',"command":{"gait":' + (QUOTED_GAITS[command.gait] ?? asciiJsonString(command.gait));
  s = appendNumbers(s + ',"velocity_mps":', command.velocity_mps);
  return s + ',"yawRate_radps":' + formatNumber(command.yawRate_radps) + '}}';
}

export type Decoded<T> = { ok: true; message: T } | ({ ok: false } & MessageProblem);

/** JSON.parse, telling a bare NaN/Infinity token (which some encoders emit) from other garbage. */
function parseJson(text: string, what: string): { ok: true; value: unknown } | ({ ok: false } & MessageProblem) {
  try {
    return { ok: true, value: JSON.parse(text) };
  } catch (error) {
    const why = error instanceof Error ? error.message : String(error);
    if (/(^|[^A-Za-z"])(-?Infinity|NaN)([^A-Za-z"]|$)/.test(text)) {
      return { ok: false, reason: 'non-finite', detail: `${what} contains NaN or Infinity, which JSON cannot carry: ${shortJson(text)}` };
    }
    return { ok: false, reason: 'malformed', detail: `${what} is not valid JSON (${why}): ${shortJson(text)}` };
  }
}

export type ReadyDecoded = Decoded<ReadyMessage> | { ok: false; reason: 'protocol-version'; detail: string };

export function decodeReady(text: string): ReadyDecoded {
  const parsed = parseJson(text, 'the handshake reply');
  if (!parsed.ok) return parsed;
  const value = parsed.value as Record<string, unknown> | null;
  if (value === null || typeof value !== 'object' || Array.isArray(value) || value.type !== 'ready') {
    return { ok: false, reason: 'malformed', detail: `expected {"type":"ready",…} as the handshake reply, got ${shortJson(value)}` };
  }
  // The version is checked before the shape: a build of another version may well send other fields.
  if (value.protocol !== PROTOCOL_VERSION) {
    return {
      ok: false,
      reason: 'protocol-version',
      detail: `the build speaks protocol ${shortJson(value.protocol)}; this harness speaks protocol ${PROTOCOL_VERSION}`,
    };
  }
  const validate = validateReady();
  if (!validate(value)) return { ok: false, ...describeSchemaError(value, validate.errors, 'the ready message') };
  return { ok: true, message: value };
}

/**
 * Reads act messages for one run into the run's Action. The validator is compiled once for the
 * robot's foot count and the build's telemetry count.
 */
export class ActionReader {
  private readonly validate;
  /** compute_us of the last message, NaN when the build did not report it. */
  reportedCompute_us = Number.NaN;

  constructor(footCount: number, telemetryCount: number) {
    this.validate = validateAct(footCount, telemetryCount);
  }

  /** Returns null when the message was copied into action, else what is wrong with it. */
  read(text: string, tick: number, action: Action): MessageProblem | null {
    const parsed = parseJson(text, `the answer to tick ${tick}`);
    if (!parsed.ok) return parsed;
    const value = parsed.value;
    if (!this.validate(value)) {
      return describeSchemaError(value, this.validate.errors, `the answer to tick ${tick}`);
    }
    return this.copy(value, tick, action);
  }

  private copy(message: ActMessage, tick: number, action: Action): MessageProblem | null {
    if (message.tick !== undefined && message.tick !== tick) {
      return { reason: 'malformed', detail: `the build answered tick ${message.tick} when tick ${tick} was asked` };
    }
    // ajv's "number" already rejects NaN and ±Infinity (JSON.parse turns 1e999 into Infinity).
    action.mode.set(message.mode);
    action.groundForce_N.set(message.groundForce_N);
    action.footTarget_m.set(message.footTarget_m);
    action.footTargetVelocity_mps.set(message.footTargetVelocity_mps);
    action.stiffness_N_per_m.set(message.stiffness_N_per_m);
    action.damping_Ns_per_m.set(message.damping_Ns_per_m);
    if (message.telemetry !== undefined) action.telemetry.set(message.telemetry);
    this.reportedCompute_us = message.compute_us ?? Number.NaN;
    return null;
  }
}

/**
 * The tick phase in JSON: one obs line out, one act line back. Continues with the decoder that
 * read the handshake, so bytes it already holds are not lost.
 */
export class JsonTickChannel implements TickChannel {
  readonly encoding = 'json' as const;
  private readonly reader: ActionReader;
  private action: Action | null = null;
  private tick = 0;

  constructor(
    footCount: number,
    telemetryCount: number,
    private readonly decoder: FrameDecoder<string>,
    private readonly frame: (payload: string) => string,
  ) {
    this.reader = new ActionReader(footCount, telemetryCount);
  }

  get reportedCompute_us(): number {
    return this.reader.reportedCompute_us;
  }

  send(stdin: Writable, obs: Observation, tick: number, action: Action): void {
    this.tick = tick;
    this.action = action;
    // Observation lines are pure ASCII, and latin1 is the cheapest way to put them on the wire.
    stdin.write(this.frame(encodeObservation(obs, tick)), 'latin1');
  }

  sendBye(stdin: Writable): void {
    stdin.write(this.frame(BYE_MESSAGE));
  }

  push(chunk: Buffer, onAnswer: (problem: MessageProblem | null) => void): void {
    this.onAnswer = onAnswer;
    const framingProblem = this.decoder.push(chunk, this.onLine);
    if (framingProblem !== null) onAnswer({ reason: 'malformed', detail: framingProblem });
  }

  private onAnswer: (problem: MessageProblem | null) => void = () => {};

  private readonly onLine = (line: string): void => {
    const action = this.action;
    if (action === null) {
      this.onAnswer({ reason: 'malformed', detail: `sent a message when none was asked (after tick ${this.tick}): ${shortJson(line)}` });
      return;
    }
    this.action = null;
    this.onAnswer(this.reader.read(line, this.tick, action));
  };

  pendingBytes(): number {
    return this.decoder.pendingBytes();
  }
}
