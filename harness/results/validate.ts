// Validation of a results.json against results.schema.json (JSON Schema 2020-12, ajv).

import { readFileSync } from 'node:fs';
import { Ajv2020, type ErrorObject, type ValidateFunction } from 'ajv/dist/2020.js';
import type { ResultsFile } from './types.js';

export const RESULTS_SCHEMA_URL = new URL('./results.schema.json', import.meta.url);

let compiled: ValidateFunction | undefined;

function validator(): ValidateFunction {
  if (compiled === undefined) {
    const schema = JSON.parse(readFileSync(RESULTS_SCHEMA_URL, 'utf8'));
    // `format` keywords are annotations here (ajv-formats is not installed); the date is checked below.
    // strictRequired/strictTypes are off because if/then/else branches name fields declared outside them.
    const ajv = new Ajv2020({ allErrors: true, strict: true, strictRequired: false, strictTypes: false, validateFormats: false });
    compiled = ajv.compile(schema);
  }
  return compiled;
}

export interface ResultsIssue {
  /** JSON pointer of the offending value, e.g. /runs/3/metrics/slipDistance_m. */
  path: string;
  message: string;
}

export type ResultsValidation = { ok: true; value: ResultsFile } | { ok: false; issues: ResultsIssue[] };

function describe(error: ErrorObject): ResultsIssue {
  const path = error.instancePath === '' ? '/' : error.instancePath;
  switch (error.keyword) {
    case 'additionalProperties':
    case 'unevaluatedProperties': {
      const key = (error.params as { additionalProperty?: string; unevaluatedProperty?: string });
      return { path, message: `unknown field "${key.additionalProperty ?? key.unevaluatedProperty}"` };
    }
    case 'required':
      return { path, message: `missing field "${(error.params as { missingProperty: string }).missingProperty}"` };
    default:
      return { path, message: error.message ?? error.keyword };
  }
}

export function validateResults(value: unknown): ResultsValidation {
  const validate = validator();
  if (!validate(value)) {
    // if/then/else and oneOf add umbrella errors after the specific ones; keep the specific ones.
    const issues = (validate.errors ?? [])
      .filter((e) => e.keyword !== 'if' && e.keyword !== 'oneOf')
      .map(describe);
    return { ok: false, issues: issues.length > 0 ? issues : [{ path: '/', message: 'does not match the results schema' }] };
  }
  const results = value as ResultsFile;
  if (Number.isNaN(Date.parse(results.startedAt))) {
    return { ok: false, issues: [{ path: '/startedAt', message: `"${results.startedAt}" is not an ISO 8601 date-time` }] };
  }
  return { ok: true, value: results };
}

export function formatResultsIssues(file: string, issues: ResultsIssue[], limit = 10): string {
  const lines = issues.slice(0, limit).map((issue) => `${file}: ${issue.path}: ${issue.message}`);
  if (issues.length > limit) lines.push(`${file}: … and ${issues.length - limit} more`);
  return lines.join('\n');
}
