// Shared fixtures: an in-memory suite folder so loader tests need no disk I/O.

import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { formatIssue, loadScenarioText, type LoadResult, type FileIssue } from '../../harness/scenario/index.js';
import { createLoadCache, type LoadOptions } from '../../harness/scenario/load.js';

export const ROOT = '/suite';
export const REPO = fileURLToPath(new URL('../../', import.meta.url));
export const ROBOT_TEXT = readFileSync(new URL('../../scenarios/robots/quad-24kg.yaml', import.meta.url), 'utf8');

export const BASE_YAML = `format: footing-scenario
formatVersion: 1
id: test-walk
revision: 1
title: Test walk
robot: robots/quad-24kg.yaml
duration_s: 8
ground:
  material: { staticFriction: 0.9, kineticFriction: 0.7 }
commands:
  - { at_s: 0, gait: stand }
  - { at_s: 1, gait: trot, velocity_mps: [0.5, 0, 0] }
`;

export function memoryFiles(extra: Record<string, string> = {}): Map<string, string> {
  return new Map(Object.entries({ [`${ROOT}/robots/quad-24kg.yaml`]: ROBOT_TEXT, ...extra }));
}

export function memoryOptions(files: Map<string, string> = memoryFiles(), share = false): LoadOptions {
  return {
    suiteRoot: ROOT,
    cwd: ROOT,
    readFile: async (p: string) => {
      const text = files.get(p);
      if (text === undefined) throw Object.assign(new Error(`no file ${p}`), { code: 'ENOENT' });
      return text;
    },
    ...(share ? { cache: createLoadCache() } : {}),
  };
}

export function load(text: string, files?: Record<string, string>, fileName = `${ROOT}/s.yaml`): Promise<LoadResult> {
  return loadScenarioText(text, fileName, memoryOptions(memoryFiles(files)));
}

export async function errorsOf(text: string, files?: Record<string, string>, fileName?: string): Promise<FileIssue[]> {
  const r = await load(text, files, fileName);
  if (r.ok) throw new Error('expected the file to be refused, but it loaded');
  return r.errors;
}

export async function errorLines(text: string, files?: Record<string, string>): Promise<string[]> {
  return (await errorsOf(text, files)).map(formatIssue);
}

/** BASE_YAML with one line replaced (by its leading text) or appended. */
export function edit(replacements: [string, string][], text = BASE_YAML): string {
  let out = text;
  for (const [from, to] of replacements) {
    if (!out.includes(from)) throw new Error(`fixture has no "${from}"`);
    out = out.replace(from, to);
  }
  return out;
}
