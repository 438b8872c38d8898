// The log map file (format footing-log-map): where each quantity of a robot log lives, in which
// unit and frame. Loaded like a scenario — parsed with positions, validated against
// map.schema.json, then checked against the robot it names — and every problem comes back with
// the file, line, column and field. Nothing throws.

import { readFileSync } from 'node:fs';
import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { Ajv2020, type ValidateFunction } from 'ajv/dist/2020.js';
import type { RobotParams, Vec3 } from '../plant/types.js';
import { formatIssue, type Finding, type FileIssue } from '../files/issue.js';
import { loadRobotFile } from '../scenario/load.js';
import { displayPath } from '../scenario/paths.js';
import { translateErrors } from '../scenario/schema.js';
import { isRecord, parseSource, scanData, type ParsedSource } from '../files/source.js';

export const LOG_MAP_FORMAT = 'footing-log-map';
export const CURRENT_LOG_MAP_VERSION = 1;

export type LogFormat = 'csv' | 'mcap';

export interface McapSource {
  topic: string;
  fields: string[];
}

/** One mapped quantity: its CSV columns and/or MCAP fields, with unit (and frame where it has one). */
export interface MappedQuantity {
  csv?: string[];
  mcap?: McapSource;
  unit?: string;
}

export interface LogMap {
  format: typeof LOG_MAP_FORMAT;
  formatVersion: 1;
  robot: string;
  feet: string[];
  time: { csv?: string; mcap?: 'logTime' | 'publishTime'; unit: string; offset_s?: number };
  trunk: {
    position: MappedQuantity;
    orientation: MappedQuantity & { kind: 'quaternion' | 'rpy'; order?: 'wxyz' | 'xyzw' };
    velocity: MappedQuantity & { frame: 'world' | 'body' };
  };
  foot: Record<string, { position: MappedQuantity; force: MappedQuantity & { sign?: 'groundOnFoot' | 'footOnGround' }; velocity?: MappedQuantity; contact?: MappedQuantity }>;
  command: { velocity: MappedQuantity; yawRate: MappedQuantity; gait?: MappedQuantity };
  externalForce?: MappedQuantity & { point_m?: Vec3 };
  scenario?: { id?: string; title?: string; revision?: number; controlRate_Hz?: number };
  import?: {
    commandTolerance?: { velocity_mps?: number; yawRate_radps?: number };
    forceNoise_N?: number;
    speedNoise_mps?: number;
    pushNoise_N?: number;
    friction?: { cell_m?: number; origin_m?: [number, number]; minNormalForce_N?: number; stickSpeed_mps?: number; slideSpeed_mps?: number; stribeckExponent?: number };
  };
}

/** A loaded map: the data, the robot it names, and where its fields are (for later messages). */
export interface LoadedLogMap {
  map: LogMap;
  robot: RobotParams;
  /** Absolute path of the robot file. */
  robotFile: string;
  /** The map file as shown in messages. */
  display: string;
  absolute: string;
  /** `file:line:column` of a field of the map (for errors found later, e.g. a missing column). */
  where(pointer: string): string;
}

export type MapLoadResult = { ok: true; loaded: LoadedLogMap } | { ok: false; errors: FileIssue[] };

let validator: ValidateFunction | undefined;
function validate(): ValidateFunction {
  if (!validator) {
    const ajv = new Ajv2020({ allErrors: true, verbose: true, strict: true, strictRequired: false, allowUnionTypes: true });
    validator = ajv.compile(JSON.parse(readFileSync(new URL('./map.schema.json', import.meta.url), 'utf8')) as object);
  }
  return validator;
}

function locateAll(findings: Finding[], src: ParsedSource, display: string): FileIssue[] {
  return findings.map((f) => {
    const pos = f.line !== undefined ? { line: f.line, column: f.column ?? 1 } : src.locate(f.path, f.at);
    return { file: f.file ?? display, ...(pos ?? {}), path: f.path, message: f.message, ...(f.hint ? { hint: f.hint } : {}) };
  });
}

/** Checks beyond the schema: feet named once each, quaternion/rpy consistency. */
function checkMap(map: LogMap): Finding[] {
  const findings: Finding[] = [];
  for (const name of map.feet) {
    if (!(name in map.foot)) findings.push({ path: '/foot', message: `no entry for foot "${name}" (every name in feet needs position and force)` });
  }
  for (const name of Object.keys(map.foot)) {
    if (!map.feet.includes(name)) findings.push({ path: `/foot/${name}`, at: 'key', message: `foot "${name}" is not in feet (${map.feet.join(', ')})` });
  }
  const o = map.trunk.orientation;
  const components = o.kind === 'quaternion' ? 4 : 3;
  if (o.kind === 'quaternion' && o.order === undefined) findings.push({ path: '/trunk/orientation', message: 'missing required field "order" (a quaternion needs its component order: wxyz or xyzw)' });
  if (o.kind === 'quaternion' && o.unit !== undefined) findings.push({ path: '/trunk/orientation/unit', message: `unit mismatch: a quaternion has no unit (got ${o.unit}); angles in rad or deg go with kind: rpy` });
  if (o.kind === 'rpy' && o.unit === undefined) findings.push({ path: '/trunk/orientation', message: 'missing required field "unit" (roll, pitch, yaw angles need rad or deg)' });
  if (o.csv && o.csv.length !== components) findings.push({ path: '/trunk/orientation/csv', message: `has ${o.csv.length} columns, expected ${components} for kind: ${o.kind}` });
  if (o.mcap && o.mcap.fields.length !== components) findings.push({ path: '/trunk/orientation/mcap/fields', message: `has ${o.mcap.fields.length} fields, expected ${components} for kind: ${o.kind}` });
  return findings;
}

export async function loadLogMap(file: string, cwd = process.cwd()): Promise<MapLoadResult> {
  const absolute = path.resolve(cwd, file);
  const display = displayPath(absolute, cwd);
  let text: string;
  try {
    text = await readFile(absolute, 'utf8');
  } catch (e) {
    return { ok: false, errors: [{ file: display, path: '', message: `cannot read the map file (${(e as NodeJS.ErrnoException).code ?? (e as Error).message})` }] };
  }
  const src = parseSource(text);
  if (src.errors.length) return { ok: false, errors: locateAll(src.errors, src, display) };
  const scan = scanData(src.value, src);
  const early = [...scan.structural, ...scan.nonFinite];
  if (early.length) return { ok: false, errors: locateAll(early, src, display) };
  if (!isRecord(src.value)) return { ok: false, errors: [{ file: display, path: '', message: `the file holds no mapping (expected format: ${LOG_MAP_FORMAT})` }] };
  if (src.value.format !== LOG_MAP_FORMAT) {
    return { ok: false, errors: locateAll([{ path: '/format', message: `format ${JSON.stringify(src.value.format ?? null)} is not a log map (expected format: ${LOG_MAP_FORMAT})` }], src, display) };
  }
  if (src.value.formatVersion !== CURRENT_LOG_MAP_VERSION) {
    return { ok: false, errors: locateAll([{ path: '/formatVersion', message: `log map version ${JSON.stringify(src.value.formatVersion ?? null)} is not known (this Footing reads version ${CURRENT_LOG_MAP_VERSION})` }], src, display) };
  }
  const check = validate();
  if (!check(src.value)) return { ok: false, errors: locateAll(translateErrors(check.errors ?? [], ''), src, display) };
  const map = src.value as unknown as LogMap;
  const findings = checkMap(map);
  if (findings.length) return { ok: false, errors: locateAll(findings, src, display) };

  const robotFile = path.resolve(path.dirname(absolute), map.robot);
  const robot = await loadRobotFile(robotFile, { cwd });
  if (!robot.ok) {
    const summary = locateAll([{ path: '/robot', message: `robot file "${map.robot}" is not a valid robot (${robot.errors.length} error${robot.errors.length === 1 ? '' : 's'} below)` }], src, display);
    return { ok: false, errors: [...summary, ...robot.errors] };
  }
  if (robot.robot.hips_m.length !== map.feet.length) {
    return { ok: false, errors: locateAll([{ path: '/feet', message: `names ${map.feet.length} feet, but robot ${robot.robot.id} has ${robot.robot.hips_m.length} (expected one name per hip, in the robot file's order)` }], src, display) };
  }
  const where = (pointer: string) => {
    const pos = src.locate(pointer);
    return pos ? `${display}:${pos.line}:${pos.column} ${pointer}` : `${display} ${pointer}`;
  };
  return { ok: true, loaded: { map, robot: robot.robot, robotFile, display, absolute, where } };
}

export { formatIssue };
