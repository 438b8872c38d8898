// A generated history (invented data, harness/history/generate.ts) in a temporary store: 60 nights
// of 4 scenarios × 2 builds, and one planted step: from night 35 on, generated-002 on build-1
// loses 0.06 of friction margin (six noise standard deviations). Build 0 carries a hostile name.

import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { generateNight, type GenerateOptions } from '../../harness/history/generate.js';
import { openSqliteStore } from '../../harness/history/sqliteStore.js';
import type { HistoryStore } from '../../harness/history/types.js';

export const HOSTILE_BUILD = '<img src=x onerror="alert(1)">&build';
export const PLANTED = { scenario: 2, build: 1, fromNight: 35, marginShift: -0.06 };

export function generatedStore(options: Partial<GenerateOptions> = {}): { file: string; store: HistoryStore; shape: GenerateOptions } {
  const file = path.join(mkdtempSync(path.join(tmpdir(), 'footing-trend-')), 'history.sqlite');
  const store = openSqliteStore(file);
  const shape: GenerateOptions = { nights: 60, scenarios: 4, builds: 2, seed: 17, step: PLANTED, ...options };
  for (let k = 0; k < shape.nights; k++) {
    const night = generateNight(shape, k);
    const rename = (name: string) => (name === 'build-0' ? HOSTILE_BUILD : name);
    store.add({ ...night, builds: night.builds.map((b) => ({ ...b, name: rename(b.name) })), runs: night.runs.map((r) => ({ ...r, build: rename(r.build) })) });
  }
  return { file, store, shape };
}
