// A suite: files and folders of scenarios, loaded in a deterministic order, with ids unique
// across files (`footing check` reports every file's problems: harness/commands/check.ts).

import { readdir, stat } from 'node:fs/promises';
import { readBoundedText } from '../files/bounded.js';
import path from 'node:path';
import { ROBOT_FORMAT, SCENARIO_FORMAT } from './format.js';
import type { FileIssue } from '../files/issue.js';
import { createLoadCache, defaultSuiteRoot, loadRobotText, loadScenarioText, peekFormat, type LoadOptions } from './load.js';
import { displayPath } from './paths.js';
import { parseSource } from '../files/source.js';
import type { ResolvedScenario } from './types.js';

export const SCENARIO_EXTENSIONS = ['.yaml', '.yml', '.json'];
/** Folders never searched: hidden ones and installed packages. */
const SKIPPED_FOLDERS = new Set(['node_modules']);

export interface SuiteFileReport {
  /** As shown in messages (relative to the working directory when inside it). */
  file: string;
  kind: 'scenario' | 'robot' | 'unknown';
  errors: FileIssue[];
  warnings: FileIssue[];
  /** Ids of the scenarios the file produced (several for a matrix). */
  scenarioIds: string[];
}

export interface SuiteResult {
  scenarios: ResolvedScenario[];
  files: SuiteFileReport[];
  /** Problems not tied to one file's content (a path that does not exist, an empty folder). */
  errors: FileIssue[];
  ok: boolean;
}

export interface SuiteOptions extends Omit<LoadOptions, 'cache'> {}

interface Entry {
  absolute: string;
  suiteRoot: string;
}

async function collect(paths: string[], opts: SuiteOptions, errors: FileIssue[], cwd: string): Promise<Entry[]> {
  const out = new Map<string, Entry>();
  for (const p of paths) {
    const absolute = path.resolve(cwd, p);
    let info;
    try {
      info = await stat(absolute);
    } catch {
      errors.push({ file: displayPath(absolute, cwd), path: '', message: 'no such file or folder' });
      continue;
    }
    if (info.isDirectory()) {
      const root = opts.suiteRoot !== undefined ? path.resolve(cwd, opts.suiteRoot) : absolute;
      const found = await walk(absolute);
      if (found.length === 0) errors.push({ file: displayPath(absolute, cwd), path: '', message: `no scenario files (${SCENARIO_EXTENSIONS.join(', ')}) in this folder` });
      for (const f of found) if (!out.has(f)) out.set(f, { absolute: f, suiteRoot: root });
    } else {
      const root = opts.suiteRoot !== undefined ? path.resolve(cwd, opts.suiteRoot) : defaultSuiteRoot(absolute);
      if (!out.has(absolute)) out.set(absolute, { absolute, suiteRoot: root });
    }
  }
  // Deterministic order: by path, compared as plain strings (no locale).
  return [...out.values()].sort((a, b) => (a.absolute < b.absolute ? -1 : a.absolute > b.absolute ? 1 : 0));
}

async function walk(folder: string): Promise<string[]> {
  const entries = await readdir(folder, { withFileTypes: true });
  const files: string[] = [];
  for (const e of entries) {
    if (e.name.startsWith('.') || SKIPPED_FOLDERS.has(e.name)) continue;
    const full = path.join(folder, e.name);
    if (e.isDirectory()) files.push(...(await walk(full)));
    else if (e.isFile() && SCENARIO_EXTENSIONS.includes(path.extname(e.name).toLowerCase())) files.push(full);
  }
  return files;
}

/**
 * Loads every scenario under `paths` (files or folders, searched recursively). Files are told
 * apart by their `format` field: robot descriptions are checked but produce no scenario; a file
 * that is neither is an error. Duplicate ids across files are an error on the later file.
 */
export async function loadSuite(paths: string[], opts: SuiteOptions = {}): Promise<SuiteResult> {
  const cwd = opts.cwd ?? process.cwd();
  const errors: FileIssue[] = [];
  const entries = await collect(paths, opts, errors, cwd);
  const cache = createLoadCache();
  const files: SuiteFileReport[] = [];
  const scenarios: ResolvedScenario[] = [];
  const firstFileOfId = new Map<string, string>();
  for (const entry of entries) {
    const display = displayPath(entry.absolute, cwd);
    let text: string;
    try {
      text = await readBoundedText(entry.absolute);
    } catch (e) {
      files.push({ file: display, kind: 'unknown', errors: [{ file: display, path: '', message: `cannot read the file (${(e as NodeJS.ErrnoException).code ?? (e as Error).message})` }], warnings: [], scenarioIds: [] });
      continue;
    }
    const format = peekFormat(text);
    if (format === ROBOT_FORMAT) {
      const robot = loadRobotText(text, entry.absolute, { cwd });
      files.push({ file: display, kind: 'robot', errors: robot.ok ? [] : robot.errors, warnings: robot.ok ? robot.warnings : [], scenarioIds: [] });
      continue;
    }
    const result = await loadScenarioText(text, entry.absolute, { ...opts, cwd, suiteRoot: entry.suiteRoot, cache });
    const report: SuiteFileReport = { file: display, kind: format === SCENARIO_FORMAT ? 'scenario' : 'unknown', errors: [], warnings: [], scenarioIds: [] };
    if (!result.ok) report.errors = result.errors;
    else {
      report.warnings = result.warnings;
      for (const s of result.scenarios) {
        const first = firstFileOfId.get(s.id);
        if (first !== undefined) {
          const at = parseSource(text).locate('/id');
          report.errors.push({ file: display, ...(at ?? {}), path: '/id', message: `id ${s.id} is already used by ${first} (expected ids unique in a suite)` });
        } else {
          firstFileOfId.set(s.id, display);
          report.scenarioIds.push(s.id);
        }
      }
      if (report.errors.length === 0) scenarios.push(...result.scenarios);
      else report.scenarioIds = [];
    }
    files.push(report);
  }
  const ok = errors.length === 0 && files.every((f) => f.errors.length === 0);
  return { scenarios, files, errors, ok };
}
