// Canonical JSON and the content hash of a resolved scenario. Keys are sorted by UTF-16 code
// units and numbers printed as ECMAScript prints them, with no whitespace — the same rules as the
// JSON Canonicalization Scheme (RFC 8785), so the hash is reproducible in any language.

import { createHash } from 'node:crypto';
import type { ResolvedScenario } from './types.js';

export function canonicalJson(value: unknown): string {
  if (value === null) return 'null';
  switch (typeof value) {
    case 'number':
      if (!Number.isFinite(value)) throw new TypeError(`canonicalJson: ${value} has no JSON form`);
      return JSON.stringify(value);
    case 'string':
      return JSON.stringify(value);
    case 'boolean':
      return value ? 'true' : 'false';
    case 'object': {
      if (Array.isArray(value)) {
        // A row of finite numbers (a raster row: a million cells in all) prints in one call, the
        // same text as element by element (JSON.stringify prints numbers as ECMAScript does).
        if (isFiniteNumberRow(value)) return JSON.stringify(value);
        return `[${value.map((v) => (v === undefined ? 'null' : canonicalJson(v))).join(',')}]`;
      }
      const record = value as Record<string, unknown>;
      const keys = Object.keys(record)
        .filter((k) => record[k] !== undefined)
        .sort();
      return `{${keys.map((k) => `${JSON.stringify(k)}:${canonicalJson(record[k])}`).join(',')}}`;
    }
    default:
      throw new TypeError(`canonicalJson: a ${typeof value} has no JSON form`);
  }
}

function isFiniteNumberRow(values: unknown[]): boolean {
  for (let k = 0; k < values.length; k++) {
    const v = values[k];
    if (typeof v !== 'number' || !Number.isFinite(v)) return false;
  }
  return true;
}

/** sha256 (hex) of the canonical JSON of a resolved scenario without its `hash` and `file`. */
export function scenarioHash(resolved: Omit<ResolvedScenario, 'hash' | 'file'> & { hash?: string; file?: string }): string {
  const { hash: _hash, file: _file, ...content } = resolved;
  return createHash('sha256').update(canonicalJson(content)).digest('hex');
}
