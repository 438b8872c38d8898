// Loading one scenario (or robot) file: parse → refuse structural hazards → check the header →
// migrate → expand the matrix → schema → physical checks → inline referenced files → defaults →
// hash. Every problem becomes a FileIssue with file, line, column and path; nothing throws.

import { createHash } from 'node:crypto';
import { createReadStream } from 'node:fs';
import { realpath } from 'node:fs/promises';
import { FILE_LIMITS, readBoundedBytes, readBoundedText } from '../files/bounded.js';
import path from 'node:path';
import type { RobotParams } from '../plant/types.js';
import { scenarioHash } from './canonical.js';
import { checkScenario } from './checks.js';
import { fillScenarioDefaults, resolveRobot, type InlinedReferences } from './defaults.js';
import { ROBOT_FORMAT, SCENARIO_FORMAT, type RobotFile, type ScenarioFile } from './format.js';
import { list, num, rec } from './guards.js';
import { formatIssue, kindOf, showValue, type Finding, type FileIssue } from '../files/issue.js';
import { hintFor } from '../files/suggest.js';
import { expandFamily, type FamilyFile } from './family.js';
import { expandMatrix } from './matrix.js';
import { CURRENT_ROBOT_VERSION, CURRENT_SCENARIO_VERSION, migrateScenario, type PathMap } from './migrate.js';
import { displayPath, isInside, resolveReference, suiteRelative } from './paths.js';
import { checkRobot } from './robot.js';
import { validateAgainst } from './schema.js';
import { scanRasterCsv } from './rasterScan.js';
import { parseSeriesCsv } from './series.js';
import { isRecord, parseSource, scanData, type ParsedSource } from '../files/source.js';
import type { ResolvedScenario } from './types.js';

export type LoadResult =
  | { ok: true; scenarios: ResolvedScenario[]; warnings: FileIssue[] }
  | { ok: false; errors: FileIssue[] };


export interface LoadOptions {
  /**
   * Folder that referenced files must stay inside. Default: the nearest ancestor folder of the
   * scenario named `scenarios`, else the scenario's own folder.
   */
  suiteRoot?: string;
  /** Reads a referenced file (robot, CSV); default the file system. Tests pass an in-memory map. */
  readFile?: (absolutePath: string) => Promise<string>;
  /** Folder messages are relative to (default process.cwd()). */
  cwd?: string;
  /** Shared between the files of a suite so a robot file is read and checked once. */
  cache?: LoadCache;
}

export interface LoadCache {
  robots: Map<string, Promise<RobotLoadResult>>;
}

export function createLoadCache(): LoadCache {
  return { robots: new Map() };
}

export type RobotLoadResult = { ok: true; robot: RobotParams; warnings: FileIssue[] } | { ok: false; errors: FileIssue[] };

interface Context {
  absolute: string;
  display: string;
  suiteRoot: string;
  cwd: string;
  readFile: (absolutePath: string) => Promise<string>;
  /** Reads a raster CSV as bytes (its own, larger size limit; the in-memory map's text as UTF-8 in tests). */
  readBytes: (absolutePath: string) => Promise<Uint8Array>;
  /** Follow symlinks when checking that references stay inside (only with the real file system). */
  realFiles: boolean;
  cache: LoadCache;
}

export function defaultSuiteRoot(absoluteFile: string): string {
  let dir = path.dirname(absoluteFile);
  for (;;) {
    if (path.basename(dir) === 'scenarios') return dir;
    const parent = path.dirname(dir);
    if (parent === dir) return path.dirname(absoluteFile);
    dir = parent;
  }
}

function makeContext(fileName: string, opts: LoadOptions): Context {
  const cwd = opts.cwd ?? process.cwd();
  const absolute = path.resolve(cwd, fileName);
  return {
    absolute,
    display: displayPath(absolute, cwd),
    suiteRoot: opts.suiteRoot !== undefined ? path.resolve(cwd, opts.suiteRoot) : defaultSuiteRoot(absolute),
    cwd,
    readFile: opts.readFile ?? ((p) => readBoundedText(p)),
    readBytes: opts.readFile ? async (p) => Buffer.from(await opts.readFile!(p), 'utf8') : (p) => readBoundedBytes(p, FILE_LIMITS.rasterFile_bytes),
    realFiles: opts.readFile === undefined,
    cache: opts.cache ?? createLoadCache(),
  };
}

function internalError(file: string, e: unknown): FileIssue {
  return { file, path: '', message: `internal error while loading (please report it): ${(e as Error)?.message ?? String(e)}` };
}

function sortIssues(issues: FileIssue[], ownFile: string): FileIssue[] {
  return issues
    .map((issue, order) => ({ issue, order }))
    .sort((a, b) => {
      const fa = a.issue.file === ownFile ? '' : a.issue.file;
      const fb = b.issue.file === ownFile ? '' : b.issue.file;
      if (fa !== fb) return fa < fb ? -1 : 1;
      const la = a.issue.line ?? Number.MAX_SAFE_INTEGER;
      const lb = b.issue.line ?? Number.MAX_SAFE_INTEGER;
      if (la !== lb) return la - lb;
      const ca = a.issue.column ?? 0;
      const cb = b.issue.column ?? 0;
      return ca !== cb ? ca - cb : a.order - b.order;
    })
    .map((x) => x.issue);
}

/** Turns findings (pointers into possibly migrated data) into located issues. */
function locator(ctx: Context, src: ParsedSource, paths?: PathMap) {
  return (f: Finding): FileIssue => {
    if (f.file !== undefined) {
      return { file: f.file, line: f.line, column: f.column, path: f.path, message: f.message, ...(f.hint ? { hint: f.hint } : {}) };
    }
    const sourcePath = paths ? paths.toSource(f.path) : f.path;
    const pos = f.line !== undefined ? { line: f.line, column: f.column ?? 1 } : src.locate(sourcePath, f.at);
    return { file: ctx.display, ...(pos ?? {}), path: sourcePath, message: f.message, ...(f.hint ? { hint: f.hint } : {}) };
  };
}

type Header = { ok: true; version: number } | { ok: false; errors: Finding[] };

function checkHeader(data: unknown, expected: string, currentVersion: number, isEmpty: boolean): Header {
  const other = expected === SCENARIO_FORMAT ? ROBOT_FORMAT : SCENARIO_FORMAT;
  if (!isRecord(data)) {
    return {
      ok: false,
      errors: [{ path: '', message: isEmpty ? `the file is empty (expected a mapping starting with format: ${expected})` : `the file holds ${kindOf(data)} (expected a mapping starting with format: ${expected})` }],
    };
  }
  const errors: Finding[] = [];
  if (!('format' in data)) {
    errors.push({ path: '', message: `missing required field "format" (expected format: ${expected})` });
  } else if (data.format === other) {
    errors.push({
      path: '/format',
      message: expected === SCENARIO_FORMAT
        ? `this is a robot description (format: ${ROBOT_FORMAT}), not a scenario; scenarios refer to it with robot: <path>`
        : `this is a scenario (format: ${SCENARIO_FORMAT}), not a robot description`,
    });
  } else if (data.format !== expected) {
    const hint = typeof data.format === 'string' ? hintFor(data.format, [expected, other]) : undefined;
    errors.push({ path: '/format', message: `${showValue(data.format)} is not a Footing file format (expected format: ${expected})`, hint });
  }
  if (!('formatVersion' in data)) {
    errors.push({ path: '', message: `missing required field "formatVersion" (expected formatVersion: ${currentVersion})` });
  } else if (!Number.isInteger(data.formatVersion)) {
    errors.push({ path: '/formatVersion', message: `${showValue(data.formatVersion)} is not a format version (expected a whole number, currently ${currentVersion})` });
  }
  if (errors.length) return { ok: false, errors };
  return { ok: true, version: data.formatVersion as number };
}

/** Loads the scenario file at `file` (YAML or JSON). Never throws. */
export async function loadScenarioFile(file: string, opts: LoadOptions = {}): Promise<LoadResult> {
  const ctx = makeContext(file, opts);
  let text: string;
  try {
    text = await readBoundedText(ctx.absolute);
  } catch (e) {
    return { ok: false, errors: [{ file: ctx.display, path: '', message: `cannot read the file (${(e as NodeJS.ErrnoException).code ?? (e as Error).message})` }] };
  }
  return loadScenarioText(text, file, opts);
}

/** Loads scenario text as if it were the file `fileName` (for messages and relative references). Never throws. */
export async function loadScenarioText(text: string, fileName: string, opts: LoadOptions = {}): Promise<LoadResult> {
  let ctx: Context | undefined;
  try {
    ctx = makeContext(fileName, opts);
    if (typeof text !== 'string') return { ok: false, errors: [{ file: ctx.display, path: '', message: `expected the file's text, got ${kindOf(text)}` }] };
    return await loadScenario(text, ctx);
  } catch (e) {
    return { ok: false, errors: [internalError(ctx?.display ?? fileName, e)] };
  }
}

/** `.json` files are strict JSON; everything else is YAML (of which JSON is a subset). */
function isJsonFile(fileName: string): boolean {
  return /\.json$/i.test(fileName);
}

async function loadScenario(text: string, ctx: Context): Promise<LoadResult> {
  const src = parseSource(text, { json: isJsonFile(ctx.display) });
  const located = locator(ctx, src);
  if (src.errors.length) return { ok: false, errors: sortIssues(src.errors.map(located), ctx.display) };
  const warnings: FileIssue[] = src.warnings.map(located);
  const scan = scanData(src.value, src);
  if (scan.structural.length) return { ok: false, errors: sortIssues([...scan.structural, ...scan.nonFinite].map(located), ctx.display) };
  const header = checkHeader(src.value, SCENARIO_FORMAT, CURRENT_SCENARIO_VERSION, text.trim() === '');
  if (!header.ok) return { ok: false, errors: sortIssues([...scan.nonFinite, ...header.errors].map(located), ctx.display) };

  const migration = migrateScenario(src.value as Record<string, unknown>, header.version);
  if (!migration.ok) return { ok: false, errors: [located({ path: '/formatVersion', message: migration.message })] };
  const locate = locator(ctx, src, migration.paths);
  if (migration.from < CURRENT_SCENARIO_VERSION) {
    warnings.push(located({
      path: '/formatVersion',
      message: `format version ${migration.from} was migrated in memory to version ${CURRENT_SCENARIO_VERSION}; consider rewriting the file in version ${CURRENT_SCENARIO_VERSION} (see docs/scenarios.md)`,
    }));
  }
  const errors: FileIssue[] = scan.nonFinite.map(located);
  const data = migration.data;

  let instances: { data: Record<string, unknown>; label?: string }[] = [{ data }];
  if ('matrix' in data) {
    const matrixErrors = validateAgainst('matrix', data.matrix, '/matrix');
    // A non-finite number inside the matrix block (already reported) also stops the expansion.
    if (matrixErrors.length || errors.some((e) => e.path === '/matrix' || e.path.startsWith('/matrix/'))) {
      return { ok: false, errors: sortIssues([...errors, ...matrixErrors.map(locate)], ctx.display) };
    }
    const expanded = expandMatrix(data);
    if (!expanded.ok) return { ok: false, errors: sortIssues([...errors, ...expanded.errors.map(locate)], ctx.display) };
    warnings.push(...expanded.warnings.map(locate));
    instances = expanded.instances;
  }

  const perInstance = await Promise.all(instances.map((inst) => loadInstance(inst.data, ctx, locate, errors.length > 0)));
  // Template problems repeat in every matrix case: report those once, and label the rest.
  const counts = new Map<string, number>();
  for (const r of perInstance) for (const key of new Set(r.errors.map(formatIssue))) counts.set(key, (counts.get(key) ?? 0) + 1);
  const emitted = new Set<string>();
  perInstance.forEach((r, k) => {
    for (const issue of r.errors) {
      const key = formatIssue(issue);
      if (counts.get(key) === perInstance.length) {
        if (!emitted.has(key)) errors.push(issue);
        emitted.add(key);
      } else {
        errors.push({ ...issue, message: `in matrix case ${instances[k].label}: ${issue.message}` });
      }
    }
    for (const w of r.warnings) {
      const key = formatIssue(w);
      if (!emitted.has(key)) warnings.push(w);
      emitted.add(key);
    }
  });
  if (errors.length) return { ok: false, errors: sortIssues(errors, ctx.display) };
  // A family instance stands for its samples (family.ts); every other instance for itself.
  return { ok: true, scenarios: perInstance.flatMap((r) => r.family ?? [r.scenario!]), warnings: sortIssues(warnings, ctx.display) };
}

interface InstanceResult {
  errors: FileIssue[];
  warnings: FileIssue[];
  scenario?: ResolvedScenario;
  /** The samples, when the instance declares a `family:` block. */
  family?: ResolvedScenario[];
}

/** `blocked`: the file already has errors (e.g. non-finite numbers), so check but do not resolve. */
async function loadInstance(data: Record<string, unknown>, ctx: Context, locate: (f: Finding) => FileIssue, blocked: boolean): Promise<InstanceResult> {
  const errors: FileIssue[] = validateAgainst('scenario', data).map(locate);
  const warnings: FileIssue[] = [];

  let robot: RobotParams | undefined;
  if (typeof data.robot === 'string' && data.robot.length > 0) {
    const loaded = await loadRobotReference(data.robot, ctx);
    if (loaded.ok) {
      robot = loaded.robot;
      warnings.push(...loaded.warnings);
    } else errors.push(...loaded.errors.map((e) => (e.file === undefined ? locate(e as Finding) : e)));
  } else if (isRecord(data.robot)) {
    const robotErrors = checkRobot(data.robot, '/robot');
    errors.push(...robotErrors.map(locate));
    if (errors.length === 0) robot = resolveRobot(data.robot as unknown as RobotFile);
  }

  const checked = checkScenario(data, robot);
  errors.push(...checked.errors.map(locate));
  warnings.push(...checked.warnings.map(locate));

  const refs: InlinedReferences = { robot: robot!, series: new Map() };
  const givenDuration = num(data.duration_s);
  const duration = givenDuration !== undefined && givenDuration > 0 ? givenDuration : undefined;
  const pushes = list(data.pushes) ?? [];
  for (let i = 0; i < pushes.length; i++) {
    const push = rec(pushes[i]);
    if (!push || typeof push.series !== 'string' || push.series.length === 0) continue;
    const pointer = `/pushes/${i}/series`;
    const text = await readReference(push.series, ctx, pointer, 'series file', errors, locate);
    if (text === undefined) continue;
    const parsed = parseSeriesCsv(text.content, text.display, pointer, num(push.at_s) ?? 0, duration);
    if (parsed.ok) refs.series.set(i, parsed);
    else errors.push(...parsed.errors.map(locate));
  }
  const raster = rec(rec(data.ground)?.raster);
  if (raster && typeof raster.file === 'string' && raster.file.length > 0 && !('staticFriction' in raster) && !('kineticFriction' in raster)) {
    const pointer = '/ground/raster/file';
    const bytes = await readReference(raster.file, ctx, pointer, 'raster file', errors, locate, ctx.readBytes);
    if (bytes !== undefined) {
      const parsed = scanRasterCsv(bytes.content, bytes.display, pointer);
      if (parsed.ok) refs.rasterGrids = parsed;
      else errors.push(...parsed.errors.map(locate));
    }
  }

  await checkRecorded(rec(data.recorded), ctx, errors, locate);

  if (blocked || errors.length || !robot) {
    if (!blocked && errors.length === 0) errors.push(locate({ path: '/robot', message: 'no usable robot (expected a robot file path or an inline robot)' }));
    return { errors, warnings };
  }
  const content = fillScenarioDefaults(data as unknown as ScenarioFile, refs);
  const hash = scenarioHash(content);
  const { id, revision, title, ...rest } = content;
  const scenario: ResolvedScenario = { id, revision, title, file: suiteRelative(ctx.absolute, ctx.suiteRoot), hash, ...rest };
  if (isRecord(data.family)) {
    const expanded = expandFamily(scenario, data.family as unknown as FamilyFile);
    if (!expanded.ok) return { errors: [...errors, ...expanded.errors.map(locate)], warnings };
    return { errors, warnings, scenario, family: expanded.scenarios };
  }
  return { errors, warnings, scenario };
}

/** An imported scenario's recorded trajectory must exist and still have the sha256 the file names. */
async function checkRecorded(recorded: Record<string, unknown> | undefined, ctx: Context, errors: FileIssue[], locate: (f: Finding) => FileIssue): Promise<void> {
  if (!recorded || typeof recorded.trajectory !== 'string' || typeof recorded.sha256 !== 'string') return;
  const pointer = '/recorded/trajectory';
  let display: string;
  let actual: string;
  if (ctx.realFiles) {
    // Streamed: an hour-long recording is more text than one string may hold.
    const resolved = await resolveInside(recorded.trajectory, ctx);
    if (!resolved.ok) {
      errors.push(locate({ path: pointer, message: `recorded trajectory ${resolved.message}` }));
      return;
    }
    display = displayPath(resolved.absolute, ctx.cwd);
    try {
      const hash = createHash('sha256');
      for await (const chunk of createReadStream(resolved.absolute, { highWaterMark: 1 << 20 })) hash.update(chunk as Buffer);
      actual = hash.digest('hex');
    } catch (e) {
      errors.push(locate({ path: pointer, message: `recorded trajectory "${recorded.trajectory}" cannot be read (${(e as NodeJS.ErrnoException).code ?? (e as Error).message}; resolved to ${display})` }));
      return;
    }
  } else {
    const text = await readReference(recorded.trajectory, ctx, pointer, 'recorded trajectory', errors, locate);
    if (text === undefined) return;
    display = text.display;
    actual = createHash('sha256').update(text.content).digest('hex');
  }
  if (actual !== recorded.sha256) {
    errors.push(locate({ path: '/recorded/sha256', message: `recorded trajectory ${display} has sha256 ${actual}, not the ${recorded.sha256} this scenario was imported with (the recording changed: re-import it, expected the file as written by footing import)` }));
  }
}

async function readReference<T = string>(
  reference: string,
  ctx: Context,
  pointer: string,
  what: string,
  errors: FileIssue[],
  locate: (f: Finding) => FileIssue,
  read: (absolutePath: string) => Promise<T> = ctx.readFile as unknown as (absolutePath: string) => Promise<T>,
): Promise<{ content: T; display: string } | undefined> {
  const resolved = await resolveInside(reference, ctx);
  if (!resolved.ok) {
    errors.push(locate({ path: pointer, message: `${what} ${resolved.message}` }));
    return undefined;
  }
  try {
    return { content: await read(resolved.absolute), display: displayPath(resolved.absolute, ctx.cwd) };
  } catch (e) {
    errors.push(locate({ path: pointer, message: `${what} "${reference}" cannot be read (${(e as NodeJS.ErrnoException).code ?? (e as Error).message}; resolved to ${displayPath(resolved.absolute, ctx.cwd)})` }));
    return undefined;
  }
}

async function resolveInside(reference: string, ctx: Context): Promise<{ ok: true; absolute: string } | { ok: false; message: string }> {
  const resolved = resolveReference(reference, ctx.absolute, ctx.suiteRoot);
  if (!resolved.ok || !ctx.realFiles) return resolved;
  // A symlink inside the suite may still point outside it.
  try {
    const [real, root] = await Promise.all([realpath(resolved.absolute), realpath(ctx.suiteRoot)]);
    if (!isInside(real, root)) return { ok: false, message: `"${reference}" is a link to ${real}, outside the suite folder ${root} (references must stay inside the suite folder)` };
  } catch {
    // A missing file is reported when it is read.
  }
  return resolved;
}

async function loadRobotReference(reference: string, ctx: Context): Promise<RobotLoadResult> {
  const resolved = await resolveInside(reference, ctx);
  if (!resolved.ok) return { ok: false, errors: [{ path: '/robot', message: `robot file ${resolved.message}` } as FileIssue & Finding] };
  let pending = ctx.cache.robots.get(resolved.absolute);
  if (!pending) {
    pending = (async (): Promise<RobotLoadResult> => {
      let text: string;
      try {
        text = await ctx.readFile(resolved.absolute);
      } catch (e) {
        return { ok: false, errors: [{ path: '/robot', message: `robot file "${reference}" cannot be read (${(e as NodeJS.ErrnoException).code ?? (e as Error).message}; resolved to ${displayPath(resolved.absolute, ctx.cwd)})` } as FileIssue & Finding] };
      }
      return loadRobotText(text, resolved.absolute, { cwd: ctx.cwd });
    })();
    ctx.cache.robots.set(resolved.absolute, pending);
  }
  const result = await pending;
  if (result.ok) return result;
  // Errors inside the robot file carry that file's name; the scenario gets one pointer to them.
  const own = result.errors.filter((e) => e.file === undefined);
  const inRobot = result.errors.filter((e) => e.file !== undefined);
  const summary = inRobot.length
    ? [{ path: '/robot', message: `robot file "${reference}" is invalid (${inRobot.length} error${inRobot.length === 1 ? '' : 's'}, listed under ${inRobot[0].file})` } as FileIssue & Finding]
    : [];
  return { ok: false, errors: [...own, ...summary, ...inRobot] };
}

/** Loads a robot description (format footing-robot). Never throws. */
export async function loadRobotFile(file: string, opts: { cwd?: string } = {}): Promise<RobotLoadResult> {
  const cwd = opts.cwd ?? process.cwd();
  const absolute = path.resolve(cwd, file);
  try {
    return loadRobotText(await readBoundedText(absolute), absolute, { cwd });
  } catch (e) {
    return { ok: false, errors: [{ file: displayPath(absolute, cwd), path: '', message: `cannot read the file (${(e as NodeJS.ErrnoException).code ?? (e as Error).message})` }] };
  }
}

export function loadRobotText(text: string, fileName: string, opts: { cwd?: string } = {}): RobotLoadResult {
  const cwd = opts.cwd ?? process.cwd();
  const absolute = path.resolve(cwd, fileName);
  const display = displayPath(absolute, cwd);
  try {
    const src = parseSource(text, { json: isJsonFile(display) });
    const ctx = { display } as Context;
    const located = locator(ctx, src);
    if (src.errors.length) return { ok: false, errors: src.errors.map(located) };
    const scan = scanData(src.value, src);
    if (scan.structural.length) return { ok: false, errors: sortIssues([...scan.structural, ...scan.nonFinite].map(located), display) };
    const header = checkHeader(src.value, ROBOT_FORMAT, CURRENT_ROBOT_VERSION, text.trim() === '');
    if (!header.ok) return { ok: false, errors: sortIssues([...scan.nonFinite, ...header.errors].map(located), display) };
    if (header.version !== CURRENT_ROBOT_VERSION) {
      const message = header.version > CURRENT_ROBOT_VERSION
        ? `the file is robot format version ${header.version}, but this Footing knows robot format version ${CURRENT_ROBOT_VERSION} only; update Footing to read it`
        : `robot format version ${header.version} never existed (expected ${CURRENT_ROBOT_VERSION})`;
      return { ok: false, errors: [located({ path: '/formatVersion', message })] };
    }
    const findings = [...scan.nonFinite, ...validateAgainst('robot', src.value), ...checkRobot(src.value, '')];
    if (findings.length) return { ok: false, errors: sortIssues(findings.map(located), display) };
    return { ok: true, robot: resolveRobot(src.value as unknown as RobotFile), warnings: src.warnings.map(located) };
  } catch (e) {
    return { ok: false, errors: [internalError(display, e)] };
  }
}

/** Peeks at a file's `format` field without validating (for sorting suite folders). */
export function peekFormat(text: string): string | undefined {
  try {
    const src = parseSource(text);
    const value = src.value;
    return isRecord(value) && typeof value.format === 'string' ? value.format : undefined;
  } catch {
    return undefined;
  }
}

