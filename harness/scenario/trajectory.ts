// The recorded trajectory: the log converted to the harness's units and frames (SI, world frame,
// quaternion w-x-y-z, ground force on the foot), one row per sample. Written next to the imported
// scenario as CSV with fixed decimals, and hashed (sha256 of the file's bytes) into the scenario's
// identity, so a scenario always names the exact recording it came from and replay compares with it.

import { createHash } from 'node:crypto';

export const TRAJECTORY_FORMAT = 'footing-recorded-trajectory';
export const TRAJECTORY_VERSION = 1;

export interface Trajectory {
  footCount: number;
  count: number;
  /** Seconds from the first sample. */
  t_s: Float64Array;
  trunkPosition_m: Float64Array; // 3·count, world
  trunkQuaternion: Float64Array; // 4·count, w x y z
  trunkVelocity_mps: Float64Array; // 3·count, world
  footPosition_m: Float64Array; // 3·N·count, world
  /** Logged, or the central difference of the foot positions when the log has none. */
  footVelocity_mps: Float64Array; // 3·N·count, world
  /** Ground force on the foot, world. */
  footForce_N: Float64Array; // 3·N·count
  /** 1 in contact, 0 not, −1 not logged. */
  contact: Int8Array; // N·count
  commandVelocity_mps: Float64Array; // 2·count, commanded heading frame
  commandYawRate_radps: Float64Array; // count
  /** Gait code (layout.ts GAIT_BY_CODE), −1 not logged. */
  commandGait: Int8Array; // count
  /** External force estimate on the trunk, world; null when not logged. */
  externalForce_N: Float64Array | null; // 3·count
}

/**
 * A zeroed trajectory of `count` samples for `footCount` feet. `unknown` fills the contact flags
 * and gait codes: −1 (not logged) while a log is converted, 0 when a file gives every value.
 */
export function createTrajectory(footCount: number, count: number, withExternal: boolean, unknown: 0 | -1 = 0): Trajectory {
  const n = footCount;
  return {
    footCount: n,
    count,
    t_s: new Float64Array(count),
    trunkPosition_m: new Float64Array(3 * count),
    trunkQuaternion: new Float64Array(4 * count),
    trunkVelocity_mps: new Float64Array(3 * count),
    footPosition_m: new Float64Array(3 * n * count),
    footVelocity_mps: new Float64Array(3 * n * count),
    footForce_N: new Float64Array(3 * n * count),
    contact: new Int8Array(n * count).fill(unknown),
    commandVelocity_mps: new Float64Array(2 * count),
    commandYawRate_radps: new Float64Array(count),
    commandGait: new Int8Array(count).fill(unknown),
    externalForce_N: withExternal ? new Float64Array(3 * count) : null,
  };
}

/** Decimals per column family: time 1 µs, position 1 µm, quaternion 1e-7, velocity 10 µm/s, force 1 mN. */
const DECIMALS = { time: 6, position: 6, quaternion: 7, velocity: 5, force: 3, rate: 5 } as const;

export function trajectoryColumns(footCount: number, withExternal: boolean): string[] {
  const columns = ['t_s', 'trunk_x_m', 'trunk_y_m', 'trunk_z_m', 'trunk_qw', 'trunk_qx', 'trunk_qy', 'trunk_qz', 'trunk_vx_mps', 'trunk_vy_mps', 'trunk_vz_mps'];
  for (let i = 0; i < footCount; i++) {
    columns.push(`foot${i}_x_m`, `foot${i}_y_m`, `foot${i}_z_m`, `foot${i}_vx_mps`, `foot${i}_vy_mps`, `foot${i}_vz_mps`, `foot${i}_fx_N`, `foot${i}_fy_N`, `foot${i}_fz_N`, `foot${i}_contact`);
  }
  columns.push('command_vx_mps', 'command_vy_mps', 'command_yawRate_radps', 'command_gait');
  if (withExternal) columns.push('external_fx_N', 'external_fy_N', 'external_fz_N');
  return columns;
}

const POWERS = [1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8];
const ZEROS = ['', '0', '00', '000', '0000', '00000', '000000', '0000000', '00000000', '000000000'];

/**
 * x with d decimals, rounded half away from zero — like toFixed, but through one integer-to-string
 * conversion (toFixed's exact decimal expansion is the import's hot spot on hour-long logs). Zero
 * has no sign. Values beyond 2^53 at that scale fall back to toFixed.
 */
export function fixed(x: number, d: number): string {
  const scaled = Math.round(Math.abs(x) * POWERS[d]);
  if (scaled === 0) return d === 0 ? '0' : `0.${ZEROS[d]}`;
  if (!(scaled < 9007199254740992)) return x.toFixed(d);
  let digits = String(scaled);
  if (digits.length <= d) digits = ZEROS[d - digits.length + 1] + digits;
  const cut = digits.length - d;
  const text = d === 0 ? digits : `${digits.slice(0, cut)}.${digits.slice(cut)}`;
  return x < 0 ? `-${text}` : text;
}

/**
 * Bytes of CSV, written digit by digit into 1 MB buffers: an hour at 1 kHz is ~1.6 GB of text,
 * more than one JavaScript string may hold, and building it from strings costs more than the rest
 * of the import together.
 */
class ByteWriter {
  readonly chunks: Buffer[] = [];
  private buffer = Buffer.allocUnsafe(1 << 20);
  private at = 0;
  private readonly digits = new Uint8Array(24);

  private room(bytes: number): void {
    if (this.at + bytes <= this.buffer.length) return;
    this.chunks.push(this.buffer.subarray(0, this.at));
    this.buffer = Buffer.allocUnsafe(1 << 20);
    this.at = 0;
  }

  text(value: string): void {
    this.room(Buffer.byteLength(value) + 1);
    this.at += this.buffer.write(value, this.at);
  }

  byte(code: number): void {
    this.room(1);
    this.buffer[this.at++] = code;
  }

  /** Same digits as fixed(x, d). */
  fixed(x: number, d: number): void {
    let scaled = Math.round(Math.abs(x) * POWERS[d]);
    if (!(scaled < 9007199254740992)) return this.text(fixed(x, d));
    this.room(24);
    if (x < 0 && scaled !== 0) this.buffer[this.at++] = 45; // '-'
    let count = 0;
    do {
      this.digits[count++] = 48 + (scaled % 10);
      scaled = Math.floor(scaled / 10);
    } while (scaled > 0 || count <= d);
    for (let k = count - 1; k >= 0; k--) {
      this.buffer[this.at++] = this.digits[k];
      if (k === d && d > 0) this.buffer[this.at++] = 46; // '.'
    }
  }

  finish(): Buffer[] {
    this.chunks.push(this.buffer.subarray(0, this.at));
    return this.chunks;
  }
}

const COMMA = 44;
const NEWLINE = 10;

/** The trajectory as CSV bytes, in chunks (a comment header names the format and the feet). */
export function formatTrajectoryChunks(tr: Trajectory, footNames: string[]): Buffer[] {
  const d = DECIMALS;
  const n = tr.footCount;
  const w = new ByteWriter();
  w.text(`# ${TRAJECTORY_FORMAT} ${TRAJECTORY_VERSION}; feet ${footNames.join(' ')} (foot0…foot${n - 1}); SI units, world frame, ground force on the foot\n`);
  w.text(trajectoryColumns(n, tr.externalForce_N !== null).join(',') + '\n');
  const value = (x: number, decimals: number) => {
    w.byte(COMMA);
    w.fixed(x, decimals);
  };
  for (let k = 0; k < tr.count; k++) {
    w.fixed(tr.t_s[k], d.time);
    for (let c = 0; c < 3; c++) value(tr.trunkPosition_m[3 * k + c], d.position);
    for (let c = 0; c < 4; c++) value(tr.trunkQuaternion[4 * k + c], d.quaternion);
    for (let c = 0; c < 3; c++) value(tr.trunkVelocity_mps[3 * k + c], d.velocity);
    for (let i = 0; i < n; i++) {
      const j = 3 * (n * k + i);
      for (let c = 0; c < 3; c++) value(tr.footPosition_m[j + c], d.position);
      for (let c = 0; c < 3; c++) value(tr.footVelocity_mps[j + c], d.velocity);
      for (let c = 0; c < 3; c++) value(tr.footForce_N[j + c], d.force);
      const flag = tr.contact[n * k + i];
      w.byte(COMMA);
      if (flag >= 0) w.byte(flag === 1 ? 49 : 48);
    }
    value(tr.commandVelocity_mps[2 * k], d.velocity);
    value(tr.commandVelocity_mps[2 * k + 1], d.velocity);
    value(tr.commandYawRate_radps[k], d.rate);
    w.byte(COMMA);
    if (tr.commandGait[k] >= 0) w.text(String(tr.commandGait[k]));
    if (tr.externalForce_N) for (let c = 0; c < 3; c++) value(tr.externalForce_N[3 * k + c], d.force);
    w.byte(NEWLINE);
  }
  return w.finish();
}

/** The trajectory as one string (small trajectories: tests, replay of short logs). */
export function formatTrajectory(tr: Trajectory, footNames: string[]): string {
  return Buffer.concat(formatTrajectoryChunks(tr, footNames)).toString('utf8');
}

export function sha256Hex(data: string | Uint8Array | Uint8Array[]): string {
  const hash = createHash('sha256');
  if (Array.isArray(data)) for (const chunk of data) hash.update(chunk);
  else hash.update(data);
  return hash.digest('hex');
}

/** Reads a trajectory file written by formatTrajectory. Throws with the line on a malformed file. */
export function parseTrajectory(text: string, file: string): Trajectory {
  const lines = text.split('\n');
  let at = 0;
  while (at < lines.length && lines[at].startsWith('#')) at++;
  const header = lines[at].split(',');
  const withExternal = header.includes('external_fx_N');
  const footCount = header.filter((h) => /^foot\d+_x_m$/.test(h)).length;
  const expected = trajectoryColumns(footCount, withExternal);
  if (header.join(',') !== expected.join(',')) throw new Error(`${file}:${at + 1}: not a ${TRAJECTORY_FORMAT} header (expected ${expected.slice(0, 4).join(',')},…)`);
  const rows = lines.slice(at + 1).filter((l) => l.length > 0);
  const count = rows.length;
  const n = footCount;
  const tr = createTrajectory(n, count, withExternal);
  for (let k = 0; k < count; k++) {
    const cells = rows[k].split(',');
    if (cells.length !== expected.length) throw new Error(`${file}:${at + 2 + k}: ${cells.length} cells, expected ${expected.length}`);
    let c = 0;
    const next = () => Number(cells[c++]);
    tr.t_s[k] = next();
    for (let m = 0; m < 3; m++) tr.trunkPosition_m[3 * k + m] = next();
    for (let m = 0; m < 4; m++) tr.trunkQuaternion[4 * k + m] = next();
    for (let m = 0; m < 3; m++) tr.trunkVelocity_mps[3 * k + m] = next();
    for (let i = 0; i < n; i++) {
      const j = 3 * (n * k + i);
      for (let m = 0; m < 3; m++) tr.footPosition_m[j + m] = next();
      for (let m = 0; m < 3; m++) tr.footVelocity_mps[j + m] = next();
      for (let m = 0; m < 3; m++) tr.footForce_N[j + m] = next();
      const flag = cells[c++];
      tr.contact[n * k + i] = flag === '' ? -1 : Number(flag);
    }
    tr.commandVelocity_mps[2 * k] = next();
    tr.commandVelocity_mps[2 * k + 1] = next();
    tr.commandYawRate_radps[k] = next();
    const gait = cells[c++];
    tr.commandGait[k] = gait === '' ? -1 : Number(gait);
    if (tr.externalForce_N) for (let m = 0; m < 3; m++) tr.externalForce_N[3 * k + m] = next();
  }
  return tr;
}
