// Trace CSV: one row per control tick (or every n-th), streamed to a temporary file and renamed on
// close, so memory does not grow with the run and a killed run leaves no truncated trace.
// Columns are fixed-point with a stated resolution (TRACE_DECIMALS) to keep files compact.

import { createAtomicStream, type AtomicStream } from '../files/atomic.js';
import type { TickSample } from '../score/sample.js';
import { ByteRows } from './fixedDecimal.js';

/** Bytes buffered before a write to the file (about 10 rows of a four-legged robot per kB). */
const ROW_BUFFER_BYTES = 1 << 16;
const COMMA = 44;
const NEWLINE = 10;
const ZERO = 48;
const ONE = 49;

/**
 * String(value) per column, remembered: a telemetry column often holds one value for many ticks
 * (a gait phase, a gain), and the same double gives the same text, so its bytes are reused
 * instead of building a string per tick.
 */
class RepeatedText {
  private readonly last: Float64Array;
  private readonly text: string[];

  constructor(columns: number) {
    this.last = new Float64Array(columns).fill(Number.NaN); // NaN equals nothing: first use builds
    this.text = new Array<string>(columns).fill('');
  }

  /** String(values[column]) as bytes (an array and an index: no double crosses the call). */
  write(rows: ByteRows, values: ArrayLike<number>, column: number): void {
    const value = values[column];
    // The same double prints the same text (0 and −0 both "0"); NaN equals nothing: rebuilt.
    if (value !== this.last[column]) {
      this.last[column] = value;
      this.text[column] = String(value);
    }
    rows.writeText(this.text[column]);
  }
}

/** `,` then values[index] in fixed point. */
function field(rows: ByteRows, values: Float64Array, index: number, decimals: number): void {
  rows.writeByte(COMMA);
  rows.writeFixed(values, index, decimals);
}

/**
 * Decimals per column family: time 1 µs, position 1 µm, velocity 10 µm/s, force 0.1 mN, quaternion
 * components 1e-7 (an angle of 0.2 µrad), angular velocity 10 µrad/s.
 */
export const TRACE_DECIMALS = { time: 6, position: 6, velocity: 5, force: 4, friction: 4, quaternion: 7, angularVelocity: 5 } as const;

export function traceColumns(footCount: number): string[] {
  const columns = [
    't_s', 'base_x_m', 'base_y_m', 'base_z_m', 'base_vx_mps', 'base_vy_mps', 'base_vz_mps',
    // Trunk orientation (w, x, y, z; trunk → world) and body-frame angular velocity.
    'base_qw', 'base_qx', 'base_qy', 'base_qz', 'base_wx_radps', 'base_wy_radps', 'base_wz_radps',
  ];
  for (let i = 0; i < footCount; i++) {
    columns.push(
      `foot${i}_x_m`,
      `foot${i}_y_m`,
      `foot${i}_z_m`,
      `foot${i}_vx_mps`,
      `foot${i}_vy_mps`,
      `foot${i}_fx_N`,
      `foot${i}_fy_N`,
      `foot${i}_fz_N`,
      `foot${i}_mus`,
      `foot${i}_loaded`,
      // The build's wanted ground force on the foot (its action for the tick), world frame.
      `foot${i}_wanted_fx_N`,
      `foot${i}_wanted_fy_N`,
      `foot${i}_wanted_fz_N`,
    );
  }
  return columns;
}

/** Relative trace path for a run: traces/<scenario-id>__<build>.csv, build name made file-safe. */
export function tracePath(scenarioId: string, build: string): string {
  const safe = (name: string) => name.replace(/[^A-Za-z0-9._-]/g, '_');
  return `traces/${safe(scenarioId)}__${safe(build)}.csv`;
}

export interface TraceWriter {
  readonly path: string;
  /** `telemetry`: the action's telemetry values, written when the writer was given names. */
  writeRow(sample: TickSample, telemetry?: ArrayLike<number>): void;
  close(): void;
  abort(): void;
}

export interface TraceOptions {
  /** Write every n-th tick only (decimation; default 1 = every tick). */
  everyNth?: number;
  /** The build's telemetry names: one column each, after every other column, `telemetry.<name>`. */
  telemetryNames?: readonly string[];
}

/** A CSV header cell: quoted (RFC 4180) when the name holds a comma, quote or line break. */
function csvCell(text: string): string {
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/**
 * `loadedThreshold_N` must be the scorer's (Scorer.loadedThreshold_N) so the `loaded` column
 * matches the samples the metrics used.
 */
export function createTraceWriter(
  file: string,
  footCount: number,
  loadedThreshold_N: number,
  options: TraceOptions = {},
): TraceWriter {
  const everyNth = options.everyNth ?? 1;
  if (!Number.isInteger(everyNth) || everyNth < 1) throw new RangeError(`trace: everyNth ${everyNth} must be a positive integer`);
  const stream: AtomicStream = createAtomicStream(file);
  const telemetryNames = options.telemetryNames ?? [];
  const telemetryHeader = telemetryNames.map((name) => `,${csvCell(`telemetry.${name}`)}`).join('');
  stream.write(`${traceColumns(footCount).join(',')}${telemetryHeader}\n`);
  const d = TRACE_DECIMALS;
  let tick = 0;
  // Rows go out as bytes, each number in the fixed-point text toFixed gives (fixedDecimal.ts).
  const rows = new ByteRows(ROW_BUFFER_BYTES, (bytes, length) => stream.writeBytes(bytes, length));
  const time = new Float64Array(1);
  const telemetryText = new RepeatedText(telemetryNames.length);

  return {
    path: file,
    writeRow(s: TickSample, telemetry?: ArrayLike<number>): void {
      if (tick++ % everyNth !== 0) return;
      time[0] = s.time_s;
      rows.writeFixed(time, 0, d.time);
      const p = s.trunkPosition_m;
      for (let a = 0; a < 3; a++) field(rows, p, a, d.position);
      const v = s.trunkVelocity_mps;
      for (let a = 0; a < 3; a++) field(rows, v, a, d.velocity);
      const q = s.trunkQuaternion;
      for (let a = 0; a < 4; a++) field(rows, q, a, d.quaternion);
      const w = s.trunkAngularVelocity_radps;
      for (let a = 0; a < 3; a++) field(rows, w, a, d.angularVelocity);
      const fp = s.footPosition_m;
      const fv = s.footVelocity_mps;
      const ff = s.footForce_N;
      const wanted = s.wantedForce_N;
      for (let i = 0; i < footCount; i++) {
        const j = 3 * i;
        field(rows, fp, j, d.position);
        field(rows, fp, j + 1, d.position);
        field(rows, fp, j + 2, d.position);
        field(rows, fv, j, d.velocity);
        field(rows, fv, j + 1, d.velocity);
        field(rows, ff, j, d.force);
        field(rows, ff, j + 1, d.force);
        field(rows, ff, j + 2, d.force);
        field(rows, s.footStaticFriction, i, d.friction);
        rows.writeByte(COMMA);
        rows.writeByte(ff[j + 2] > loadedThreshold_N ? ONE : ZERO);
        field(rows, wanted, j, d.force);
        field(rows, wanted, j + 1, d.force);
        field(rows, wanted, j + 2, d.force);
      }
      // Telemetry in the build's own units: the shortest text that reads back to the same double.
      for (let k = 0; k < telemetryNames.length; k++) {
        rows.writeByte(COMMA);
        if (telemetry !== undefined) telemetryText.write(rows, telemetry, k);
      }
      rows.writeByte(NEWLINE);
    },
    close: () => {
      rows.flush();
      stream.close();
    },
    abort: () => stream.abort(),
  };
}
