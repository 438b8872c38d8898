// JSON Schema validation (ajv, draft 2020-12, allErrors) and the translation of ajv's errors into
// messages that name the field, the value and what is expected, with "did you mean" for typos.

import type { ErrorObject, ValidateFunction } from 'ajv/dist/2020.js';
import { kindOf, pointerJoin, pointerSegments, showValue, type Finding } from '../files/issue.js';
import { schemaValidator } from '../files/schema.js';
import { hintFor } from '../files/suggest.js';

interface Validators {
  scenario: ValidateFunction;
  robot: ValidateFunction;
  matrix: ValidateFunction;
}
let validators: Validators | undefined;

const ROBOT_SCHEMA_URL = new URL('./robot.schema.json', import.meta.url);
const SCENARIO_SCHEMA_URL = new URL('./scenario.schema.json', import.meta.url);

function getValidators(): Validators {
  validators ??= {
    scenario: schemaValidator(SCENARIO_SCHEMA_URL, { references: [ROBOT_SCHEMA_URL] }),
    robot: schemaValidator(ROBOT_SCHEMA_URL),
    matrix: schemaValidator(SCENARIO_SCHEMA_URL, { fragment: '#/$defs/matrix', references: [ROBOT_SCHEMA_URL] }),
  };
  return validators;
}

export function validateAgainst(which: keyof Validators, value: unknown, basePath = ''): Finding[] {
  const validate = getValidators()[which];
  if (validate(value)) return [];
  return translateErrors(validate.errors ?? [], basePath);
}

function fieldName(pointer: string): string {
  const segments = pointerSegments(pointer);
  for (let i = segments.length - 1; i >= 0; i--) if (!/^\d+$/.test(segments[i])) return segments[i];
  return 'value';
}

function describeExpectation(schema: unknown): string {
  const description = (schema as { description?: unknown } | null)?.description;
  return typeof description === 'string' ? description : '';
}

export function translateErrors(errors: ErrorObject[], basePath: string): Finding[] {
  const out: Finding[] = [];
  const seen = new Set<string>();
  const push = (f: Finding) => {
    const key = `${f.path}\u0000${f.message}`;
    if (!seen.has(key)) {
      seen.add(key);
      out.push(f);
    }
  };
  for (const e of errors) {
    const path = basePath + e.instancePath;
    const value = e.data;
    const field = fieldName(path);
    const parent = e.parentSchema as Record<string, unknown> | undefined;
    switch (e.keyword) {
      case 'if':
        break; // the failing then/else branch reports the real problem
      case 'additionalProperties': {
        const name = String((e.params as { additionalProperty: string }).additionalProperty);
        const known = Object.keys((parent?.properties as object | undefined) ?? {});
        const hint = hintFor(name, known) ?? (known.length > 0 && known.length <= 12 ? `known fields: ${known.join(', ')}` : undefined);
        push({ path: pointerJoin(path, name), at: 'key', message: `unknown field "${name}"`, hint });
        break;
      }
      case 'required': {
        const name = String((e.params as { missingProperty: string }).missingProperty);
        const about = describeExpectation((parent?.properties as Record<string, unknown> | undefined)?.[name]);
        push({ path, message: `missing required field "${name}"${about ? ` (${about})` : ''}` });
        break;
      }
      case 'type': {
        if (typeof value === 'number' && !Number.isFinite(value)) break; // reported by scanData
        const expected = String((e.params as { type: string | string[] }).type).split(',').join(' or ');
        push({ path, message: `${showValue(value)} is ${kindOf(value)}, expected ${expected === 'object' ? 'a mapping' : expected === 'array' ? 'a list' : `a ${expected}`}${describeSuffix(e.parentSchema)}` });
        break;
      }
      case 'const': {
        const allowed = (e.params as { allowedValue: unknown }).allowedValue;
        push({ path, message: `${showValue(value)} is not allowed here (expected ${field}: ${showValue(allowed)})` });
        break;
      }
      case 'enum': {
        const allowed = ((e.params as { allowedValues: unknown[] }).allowedValues ?? []).map(String);
        push({
          path,
          message: `${showValue(value)} is not one of ${allowed.map((a) => JSON.stringify(a)).join(', ')}`,
          hint: typeof value === 'string' ? hintFor(value, allowed) : undefined,
        });
        break;
      }
      case 'minimum':
      case 'maximum':
      case 'exclusiveMinimum':
      case 'exclusiveMaximum': {
        const { comparison, limit } = e.params as { comparison: string; limit: number };
        push({ path, message: `${showValue(value)} is out of range (expected ${field} ${comparison.replace('>=', '≥').replace('<=', '≤')} ${limit})` });
        break;
      }
      case 'minItems':
      case 'maxItems': {
        const limit = (e.params as { limit: number }).limit;
        const n = Array.isArray(value) ? value.length : 0;
        const exact = parent && parent.minItems === parent.maxItems;
        const expected = exact ? `exactly ${limit}` : e.keyword === 'minItems' ? `at least ${limit}` : `at most ${limit}`;
        push({ path, message: `has ${n} item${n === 1 ? '' : 's'}, expected ${expected}${describeSuffix(parent)}` });
        break;
      }
      case 'minProperties':
      case 'maxProperties': {
        const limit = (e.params as { limit: number }).limit;
        const keys = value && typeof value === 'object' ? Object.keys(value) : [];
        const exact = parent && parent.minProperties === parent.maxProperties;
        const expected = exact ? `exactly ${limit}` : e.keyword === 'minProperties' ? `at least ${limit}` : `at most ${limit}`;
        push({ path, message: `has ${keys.length} field${keys.length === 1 ? '' : 's'}${keys.length ? ` (${keys.join(', ')})` : ''}, expected ${expected}${describeSuffix(parent)}` });
        break;
      }
      case 'minLength':
        push({ path, message: `${showValue(value)} is too short (expected at least ${plural((e.params as { limit: number }).limit, 'character')})` });
        break;
      case 'maxLength':
        push({ path, message: `${showValue(value)} is too long (expected at most ${plural((e.params as { limit: number }).limit, 'character')})` });
        break;
      case 'pattern':
        if (e.propertyName !== undefined) break; // reported below, at the key
        push({ path, message: `${showValue(value)} is not a valid ${field} (${patternExpectation((e.params as { pattern: string }).pattern)})` });
        break;
      case 'propertyNames':
        break; // the nested pattern error names the key
      case 'uniqueItems': {
        const { i, j } = e.params as { i: number; j: number };
        push({ path, message: `items ${j} and ${i} are the same (expected each entry once)` });
        break;
      }
      default:
        push({ path, message: `${e.message ?? 'is invalid'}` });
    }
  }
  // A propertyNames failure reports the key itself as data; point at it.
  for (const e of errors) {
    if (e.keyword === 'pattern' && e.propertyName !== undefined) {
      const path = pointerJoin(basePath + e.instancePath, e.propertyName);
      push({ path, at: 'key', message: `"${e.propertyName}" is not a valid parameter name (expected letters, digits and _, not starting with a digit)` });
    }
  }
  return out;
}

const ID_PATTERN = '^[a-z0-9]+(-[a-z0-9]+)*$';

function patternExpectation(pattern: string): string {
  if (pattern === ID_PATTERN) return 'expected lowercase letters and digits in words joined by single hyphens, e.g. ice-strip-diagonal';
  return `expected text matching ${pattern}`;
}

function plural(n: number, word: string): string {
  return `${n} ${word}${n === 1 ? '' : 's'}`;
}

function describeSuffix(schema: unknown): string {
  const d = describeExpectation(schema);
  return d ? ` — ${d}` : '';
}
