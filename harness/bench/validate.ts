// Validation of bench figures against bench.schema.json (JSON Schema 2020-12, ajv).

import { readFileSync } from 'node:fs';
import { Ajv2020, type ValidateFunction } from 'ajv/dist/2020.js';
import type { BenchReport } from './types.js';

export const BENCH_SCHEMA_URL = new URL('./bench.schema.json', import.meta.url);

let compiled: ValidateFunction | undefined;

function validator(): ValidateFunction {
  if (compiled === undefined) {
    const schema = JSON.parse(readFileSync(BENCH_SCHEMA_URL, 'utf8'));
    // strictRequired off: `required` inside allOf-extended objects names fields declared beside it.
    const ajv = new Ajv2020({ allErrors: true, strict: true, strictRequired: false, strictTypes: false });
    compiled = ajv.compile(schema);
  }
  return compiled;
}

export type BenchValidation = { ok: true; value: BenchReport } | { ok: false; issues: string[] };

/** Checks a parsed bench JSON; issues read "<JSON pointer>: <message>". */
export function validateBench(value: unknown): BenchValidation {
  const validate = validator();
  if (validate(value)) return { ok: true, value: value as BenchReport };
  const issues = (validate.errors ?? []).map((e) => `${e.instancePath === '' ? '/' : e.instancePath}: ${e.message ?? e.keyword}`);
  return { ok: false, issues };
}
