// Validation of bench figures against bench.schema.json (JSON Schema 2020-12, ajv).

import { schemaValidator } from '../files/schema.js';
import type { BenchReport } from './types.js';

export const BENCH_SCHEMA_URL = new URL('./bench.schema.json', import.meta.url);

const validator = () => schemaValidator(BENCH_SCHEMA_URL);

export type BenchValidation = { ok: true; value: BenchReport } | { ok: false; issues: string[] };

/** Checks a parsed bench JSON; issues read "<JSON pointer>: <message>". */
export function validateBench(value: unknown): BenchValidation {
  const validate = validator();
  if (validate(value)) return { ok: true, value: value as BenchReport };
  const issues = (validate.errors ?? []).map((e) => `${e.instancePath === '' ? '/' : e.instancePath}: ${e.message ?? e.keyword}`);
  return { ok: false, issues };
}
