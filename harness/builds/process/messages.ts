// JSON Schemas of the messages a build sends (protocol version 1; docs/protocol.md), compiled with
// ajv once per (foot count, telemetry count) so every array length is checked against the robot.
// Messages the harness sends are produced by codec.ts and need no validation.

import { Ajv, type ErrorObject, type ValidateFunction } from 'ajv';

export const PROTOCOL_VERSION = 1;

/**
 * Encodings of the tick messages (the handshake is always JSON): 'json' lines, or 'f64' fixed
 * binary frames of little-endian doubles (binary.ts). The harness offers, the build chooses.
 */
export const WIRE_ENCODINGS = ['json', 'f64'] as const;
export type WireEncoding = (typeof WIRE_ENCODINGS)[number];

/** Longest telemetry name accepted, characters (names end up as CSV headers and plot labels). */
export const MAX_TELEMETRY_NAME_LENGTH = 120;

export interface ReadyMessage {
  type: 'ready';
  protocol: number;
  telemetryNames: string[];
  /** Optional free text the build reports about itself (version, commit), kept in results. */
  about?: string;
  /** Encoding of the tick messages, one the hello offered; 'json' when absent. */
  encoding?: WireEncoding;
}

export interface ActMessage {
  type: 'act';
  tick?: number;
  mode: number[];
  groundForce_N: number[];
  footTarget_m: number[];
  footTargetVelocity_mps: number[];
  stiffness_N_per_m: number[];
  damping_Ns_per_m: number[];
  telemetry?: number[];
  compute_us?: number;
}

const ajv = new Ajv({ allErrors: false, strict: true });

export const readySchema = {
  type: 'object',
  required: ['type', 'protocol', 'telemetryNames'],
  additionalProperties: false,
  properties: {
    type: { const: 'ready' },
    protocol: { type: 'integer' },
    telemetryNames: {
      type: 'array',
      uniqueItems: true,
      items: { type: 'string', minLength: 1, maxLength: MAX_TELEMETRY_NAME_LENGTH },
    },
    about: { type: 'string', maxLength: 500 },
    encoding: { enum: [...WIRE_ENCODINGS] },
  },
} as const;

export function actSchema(footCount: number, telemetryCount: number): object {
  const numbers = (count: number) => ({
    type: 'array',
    minItems: count,
    maxItems: count,
    items: { type: 'number' },
  });
  const required = [
    'type',
    'mode',
    'groundForce_N',
    'footTarget_m',
    'footTargetVelocity_mps',
    'stiffness_N_per_m',
    'damping_Ns_per_m',
  ];
  // A build without telemetry may leave the field out; one with telemetry must send all of it.
  if (telemetryCount > 0) required.push('telemetry');
  return {
    type: 'object',
    required,
    additionalProperties: false,
    properties: {
      type: { const: 'act' },
      tick: { type: 'integer', minimum: 0 },
      mode: { type: 'array', minItems: footCount, maxItems: footCount, items: { enum: [0, 1] } },
      groundForce_N: numbers(3 * footCount),
      footTarget_m: numbers(3 * footCount),
      footTargetVelocity_mps: numbers(3 * footCount),
      stiffness_N_per_m: numbers(footCount),
      damping_Ns_per_m: numbers(footCount),
      telemetry: numbers(telemetryCount),
      compute_us: { type: 'number', minimum: 0 },
    },
  };
}

let readyValidator: ValidateFunction<ReadyMessage> | null = null;
const actValidators = new Map<string, ValidateFunction<ActMessage>>();

export function validateReady(): ValidateFunction<ReadyMessage> {
  if (readyValidator === null) readyValidator = ajv.compile<ReadyMessage>(readySchema);
  return readyValidator;
}

export function validateAct(footCount: number, telemetryCount: number): ValidateFunction<ActMessage> {
  const key = `${footCount}/${telemetryCount}`;
  const cached = actValidators.get(key);
  if (cached !== undefined) return cached;
  const validator = ajv.compile<ActMessage>(actSchema(footCount, telemetryCount));
  actValidators.set(key, validator);
  return validator;
}

export interface MessageProblem {
  reason: 'malformed' | 'non-finite';
  detail: string;
}

/**
 * Turns the first ajv error into words naming the field and value. A `null` where a number is
 * expected is the JSON shape of a NaN (many encoders write NaN as null), so it is 'non-finite'.
 */
export function describeSchemaError(
  message: unknown,
  errors: ErrorObject[] | null | undefined,
  what: string,
): MessageProblem {
  const error = errors?.[0];
  if (error === undefined) return { reason: 'malformed', detail: `${what} is invalid` };
  const value = valueAt(message, error.instancePath);
  const field = error.instancePath === '' ? what : `${what} field ${fieldName(error.instancePath)}`;
  // JSON.parse reads 1e999 as Infinity, which ajv's "number" refuses: that is non-finite too.
  const notFinite = value === null || (typeof value === 'number' && !Number.isFinite(value));
  const reason = error.keyword === 'type' && error.params.type === 'number' && notFinite ? 'non-finite' : 'malformed';
  let extra = '';
  if (error.keyword === 'additionalProperties') extra = ` ('${String(error.params.additionalProperty)}')`;
  return { reason, detail: `${field} = ${shortJson(value)}: ${error.message ?? 'invalid'}${extra}` };
}

/** `/groundForce_N/5` → `groundForce_N[5]`. */
function fieldName(pointer: string): string {
  let name = '';
  for (const part of pointer.slice(1).split('/')) {
    name += /^\d+$/.test(part) ? `[${part}]` : name === '' ? part : `.${part}`;
  }
  return name;
}

function valueAt(root: unknown, pointer: string): unknown {
  if (pointer === '') return root;
  let node: unknown = root;
  for (const raw of pointer.slice(1).split('/')) {
    const key = raw.replace(/~1/g, '/').replace(/~0/g, '~');
    if (node === null || typeof node !== 'object') return undefined;
    node = (node as Record<string, unknown>)[key];
  }
  return node;
}

export function shortJson(value: unknown, max = 120): string {
  let text: string;
  try {
    text = JSON.stringify(value) ?? String(value);
  } catch {
    text = String(value);
  }
  return text.length > max ? `${text.slice(0, max)}…` : text;
}
