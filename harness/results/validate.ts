// Validation of a results.json against results.schema.json (JSON Schema 2020-12, ajv).

import type { ErrorObject } from 'ajv/dist/2020.js';
import type { Finding } from '../files/issue.js';
import { schemaValidator } from '../files/schema.js';
import type { ResultsFile } from './types.js';

export const RESULTS_SCHEMA_URL = new URL('./results.schema.json', import.meta.url);

// `format` keywords are annotations (files/schema.ts); the start date is checked below.
const validator = () => schemaValidator(RESULTS_SCHEMA_URL);

export type ResultsValidation = { ok: true; value: ResultsFile } | { ok: false; issues: Finding[] };

/** An ajv error as a finding at the JSON pointer of the offending value (e.g. /runs/3/metrics/slipDistance_m). */
function describe(error: ErrorObject): Finding {
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

export function formatResultsIssues(file: string, issues: Finding[], limit = 10): string {
  const lines = issues.slice(0, limit).map((issue) => `${file}: ${issue.path}: ${issue.message}`);
  if (issues.length > limit) lines.push(`${file}: … and ${issues.length - limit} more`);
  return lines.join('\n');
}
