// `footing import LOG --map MAP --out DIR`: a robot log (CSV or MCAP) and its map → a scenario
// folder. Every check runs before anything is written; the files are staged in a temporary folder
// inside DIR, loaded back through the scenario loader (the same validation `footing check` does),
// and only then moved into place, each by an atomic rename. Bad input: exit 2, nothing written.

import { closeSync, copyFileSync, mkdirSync, openSync, readFileSync, renameSync, rmSync, statSync, writeFileSync, writeSync } from 'node:fs';
import { mkdtemp } from 'node:fs/promises';
import { createReadStream } from 'node:fs';
import { createHash } from 'node:crypto';
import path from 'node:path';
import { formatIssue } from '../files/issue.js';
import { loadScenarioFile } from '../scenario/load.js';
import { displayPath } from '../scenario/paths.js';
import type { Vec3 } from '../plant/types.js';
import { commandTimeline } from './commandTimeline.js';
import { convertLog } from './convert.js';
import { readCsvLog } from './csvLog.js';
import { importSettings } from './defaults.js';
import { identifyFriction, type FrictionIdentification } from './friction.js';
import { buildLayout } from './layout.js';
import { loadLogMap, type LoadedLogMap, type LogFormat } from './map.js';
import { readMcapLog } from './mcapLog.js';
import { estimatePushes } from './pushSeries.js';
import type { ProgressCallback } from './rawLog.js';
import { pushCsv, scenarioFileNames, scenarioYaml } from './scenarioWriter.js';
import { formatTrajectoryChunks, sha256Hex, type Trajectory } from '../scenario/trajectory.js';

export const IMPORT_EXIT = { ok: 0, badInput: 2, internal: 3 } as const;

/** The scenario schema's limit on duration_s (harness/scenario/scenario.schema.json). */
const MAX_SCENARIO_DURATION_s: number = JSON.parse(readFileSync(new URL('../scenario/scenario.schema.json', import.meta.url), 'utf8')).properties.duration_s.maximum;

export interface ImportOptions {
  log: string;
  map: string;
  out: string;
  cwd?: string;
  /** Overrides the map's scenario id. */
  id?: string;
  onProgress?: ProgressCallback;
}

export interface ImportOutcome {
  exitCode: number;
  lines: string[];
  /** Present on success. */
  scenarioFile?: string;
  hash?: string;
  friction?: FrictionIdentification;
  trajectory?: Trajectory;
}

/** sha256 of a file, streamed (logs can be gigabytes). */
export async function fileSha256(file: string): Promise<string> {
  const hash = createHash('sha256');
  for await (const chunk of createReadStream(file, { highWaterMark: 1 << 20 })) hash.update(chunk as Buffer);
  return hash.digest('hex');
}

export function logFormatOf(file: string): LogFormat | undefined {
  const ext = path.extname(file).toLowerCase();
  return ext === '.csv' ? 'csv' : ext === '.mcap' ? 'mcap' : undefined;
}

function writeChunks(file: string, chunks: Buffer[]): void {
  const fd = openSync(file, 'wx');
  try {
    for (const chunk of chunks) for (let at = 0; at < chunk.length; ) at += writeSync(fd, chunk, at);
  } finally {
    closeSync(fd);
  }
}

const fail = (lines: string[]): ImportOutcome => ({ exitCode: IMPORT_EXIT.badInput, lines: [...lines, 'footing import: nothing was written'] });

/** Reads and converts a log through its map: the steps import and the tests share. */
export async function readRecording(logFile: string, loaded: LoadedLogMap, cwd: string, onProgress?: ProgressCallback): Promise<{ ok: true; trajectory: Trajectory; format: LogFormat } | { ok: false; lines: string[] }> {
  const absolute = path.resolve(cwd, logFile);
  const display = displayPath(absolute, cwd);
  const format = logFormatOf(absolute);
  if (!format) return { ok: false, lines: [`${display}: unknown log format "${path.extname(absolute) || '(no extension)'}" (expected .csv or .mcap)`] };
  try {
    if (!statSync(absolute).isFile()) return { ok: false, lines: [`${display}: not a file`] };
  } catch (e) {
    return { ok: false, lines: [`${display}: cannot read the log (${(e as NodeJS.ErrnoException).code ?? (e as Error).message})`] };
  }
  const layout = buildLayout(loaded, format);
  if (!layout.ok) return { ok: false, lines: layout.errors };
  const raw = format === 'csv' ? await readCsvLog(absolute, display, loaded, layout.layout, onProgress) : await readMcapLog(absolute, display, loaded, layout.layout, onProgress);
  if (!raw.ok) return { ok: false, lines: raw.errors };
  const converted = convertLog(raw.log, loaded, layout.layout);
  if (!converted.ok) return { ok: false, lines: converted.errors };
  return { ok: true, trajectory: converted.trajectory, format };
}

export async function importLog(options: ImportOptions): Promise<ImportOutcome> {
  const cwd = options.cwd ?? process.cwd();
  const mapLoad = await loadLogMap(options.map, cwd);
  if (!mapLoad.ok) return fail(mapLoad.errors.map(formatIssue));
  const loaded = mapLoad.loaded;
  const map = loaded.map;
  const logAbsolute = path.resolve(cwd, options.log);
  const baseName = path.basename(logAbsolute, path.extname(logAbsolute)).toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-+|-+$/g, '');
  const id = options.id ?? map.scenario?.id ?? baseName;
  if (!/^[a-z0-9]+(-[a-z0-9]+)*$/.test(id)) return fail([`footing import: scenario id "${id}" is not lowercase words joined by - (give --id)`]);

  const read = await readRecording(options.log, loaded, cwd, options.onProgress);
  if (!read.ok) return fail(read.lines);
  const tr = read.trajectory;
  const last_s = tr.t_s[tr.count - 1];
  if (last_s > MAX_SCENARIO_DURATION_s) {
    return fail([`${displayPath(logAbsolute, cwd)}: the log runs to ${last_s.toFixed(3)} s of scenario time (with the map's offset_s), longer than a scenario may last (expected ≤ ${MAX_SCENARIO_DURATION_s} s: cut the log, or import it in parts)`]);
  }
  const settings = importSettings(map);
  const commands = commandTimeline(tr, settings.commandTolerance);
  const push = estimatePushes(tr, loaded.robot, settings.pushNoise_N);
  const friction = identifyFriction(tr, settings.friction, settings.forceNoise_N);
  const names = scenarioFileNames(id, loaded.robotFile);
  const trajectoryChunks = formatTrajectoryChunks(tr, map.feet);
  const trajectorySha256 = sha256Hex(trajectoryChunks);
  const logSha256 = await fileSha256(logAbsolute);
  const provenance = [
    `Imported by footing import from ${path.basename(logAbsolute)} (${read.format}, sha256 ${logSha256.slice(0, 16)}…)`,
    `with map ${path.basename(loaded.absolute)}; ${tr.count} samples over ${tr.t_s[tr.count - 1].toFixed(3)} s.`,
  ];
  const yaml = scenarioYaml({
    id,
    title: map.scenario?.title ?? `Recorded run ${id}`,
    revision: map.scenario?.revision ?? 1,
    controlRate_Hz: map.scenario?.controlRate_Hz,
    robot: loaded.robot,
    robotFileName: names.robot,
    trajectory: tr,
    trajectoryFile: names.trajectory,
    trajectorySha256,
    commands,
    push,
    pushFile: names.push,
    pushPoint_m: (map.externalForce?.point_m ?? [0, 0, 0]) as Vec3,
    friction,
    provenance,
  });

  const outDir = path.resolve(cwd, options.out);
  let stage: string | undefined;
  try {
    mkdirSync(outDir, { recursive: true });
    stage = await mkdtemp(path.join(outDir, '.footing-import-'));
    const staged = (name: string) => path.join(stage!, name);
    writeChunks(staged(names.trajectory), trajectoryChunks);
    if (push.t_s.length > 0) writeFileSync(staged(names.push), pushCsv(push));
    writeFileSync(staged(names.friction), JSON.stringify({ format: 'footing-friction-identification', formatVersion: 1, scenario: id, ...friction }, null, 2) + '\n');
    mkdirSync(staged('robots'));
    copyFileSync(loaded.robotFile, path.join(stage, 'robots', names.robot));
    writeFileSync(staged(names.scenario), yaml);
    const check = await loadScenarioFile(staged(names.scenario), { suiteRoot: stage, cwd });
    if (!check.ok) {
      return { exitCode: IMPORT_EXIT.internal, lines: ['footing import: internal error: the written scenario does not load (please report it):', ...check.errors.map(formatIssue), 'footing import: nothing was written'] };
    }
    const files = [names.trajectory, ...(push.t_s.length > 0 ? [names.push] : []), names.friction, path.join('robots', names.robot), names.scenario];
    mkdirSync(path.join(outDir, 'robots'), { recursive: true });
    for (const name of files) renameSync(path.join(stage, name), path.join(outDir, name));
    const scenarioFile = path.join(outDir, names.scenario);
    const slid = friction.regions.filter((r) => r.verdict === 'slid').length;
    const lines = [
      `footing import: ${displayPath(logAbsolute, cwd)} (${read.format}, ${tr.count} samples, ${tr.t_s[tr.count - 1].toFixed(3)} s) → ${displayPath(scenarioFile, cwd)}`,
      `  scenario ${id} hash ${check.scenarios[0].hash}`,
      `  commands: ${commands.length} segments; push: ${push.t_s.length > 0 ? `${push.t_s.length} points from the ${push.source === 'externalForce' ? 'external-force estimate' : 'residual'}, peak ${push.peak_N.toFixed(1)} N` : 'none'}`,
      `  friction: ${friction.regions.length} cells of ${friction.cell_m} m with loaded samples, ${slid} with slides (μs and μk intervals), ${friction.regions.length - slid} with a lower bound on μs only`,
    ];
    return { exitCode: IMPORT_EXIT.ok, lines, scenarioFile, hash: check.scenarios[0].hash, friction, trajectory: tr };
  } finally {
    if (stage) rmSync(stage, { recursive: true, force: true });
  }
}
