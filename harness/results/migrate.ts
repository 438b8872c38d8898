// Older results files, read in memory as the current format. Version 1 → 2 only added optional
// fields (run `margin`, scenario `family`, top-level `families`), so a v1 file is a v2 file with
// a different version number. Optional fields added within version 2 (scenario `start`,
// scenario `lowestStaticFriction`) need no step: a file without them is read as it is, and the
// summary's ahead table simply finds no slippery scenario in it. Anything else is left alone for
// the schema to report.

import { RESULTS_FORMAT, RESULTS_FORMAT_VERSION } from './types.js';

export interface MigratedResults {
  value: unknown;
  /** The version the file was written in (undefined when it is not a results object). */
  from: number | undefined;
}

export function migrateResults(value: unknown): MigratedResults {
  if (value === null || typeof value !== 'object' || Array.isArray(value)) return { value, from: undefined };
  const record = value as Record<string, unknown>;
  if (record.format !== RESULTS_FORMAT || typeof record.formatVersion !== 'number') return { value, from: undefined };
  const from = record.formatVersion;
  if (from === 1) return { value: { ...record, formatVersion: RESULTS_FORMAT_VERSION }, from };
  return { value, from };
}
