// Loading a gate policy file (YAML): parse, validate against policy.schema.json, fill defaults.
// Errors name the file, line, column, path, the value and what is expected, with a did-you-mean
// for misspelt keys.

import { readFileSync } from 'node:fs';
import type { ErrorObject } from 'ajv/dist/2020.js';
import { pointerSegments, type FileIssue } from '../files/issue.js';
import { schemaValidator } from '../files/schema.js';
import { parseSettingsYaml, positionOf, valueAt } from '../files/source.js';
import { suggestName } from '../files/suggest.js';
import { DEFAULT_GATE_RULES, GATE_RULE_NAMES, type GatePolicy, type GateRules } from './defaults.js';

export const POLICY_SCHEMA_URL = new URL('./policy.schema.json', import.meta.url);

export class PolicyError extends Error {
  constructor(readonly issues: FileIssue[]) {
    super(issues.map(formatPolicyIssue).join('\n'));
    this.name = 'PolicyError';
  }
}

/** `file:line:column: dotted.path: message`, the form of policy and config issues (paths as keys). */
export function formatPolicyIssue(issue: FileIssue): string {
  const where = issue.line === undefined ? issue.file : `${issue.file}:${issue.line}:${issue.column}`;
  return `${where}: ${issue.path === '' ? '(top level)' : issue.path}: ${issue.message}`;
}

const validator = () => schemaValidator(POLICY_SCHEMA_URL);

const TOP_LEVEL_KEYS: readonly string[] = [...GATE_RULE_NAMES, 'version', 'overrides'];

function didYouMean(key: string, allowed: readonly string[]): string {
  const guess = suggestName(key, allowed);
  return guess === undefined ? '' : `; did you mean "${guess}"?`;
}

function show(value: unknown): string {
  return typeof value === 'string' ? JSON.stringify(value) : JSON.stringify(value) ?? String(value);
}

function expectation(error: ErrorObject): string {
  const p = error.params as Record<string, unknown>;
  switch (error.keyword) {
    case 'type': {
      // Rules accept null (off), so their type is a list: name the useful type, then null.
      const types = String(p.type).split(',');
      const orOff = types.includes('null') ? ', or null to switch the rule off' : '';
      if (types.includes('boolean')) return `expected true or false${orOff}`;
      if (types.includes('object')) return 'expected a mapping (key: value lines)';
      return `expected a ${types.filter((t) => t !== 'null').join(' or ')}${orOff}`;
    }
    case 'minimum':
      return `expected a number ≥ ${p.limit}`;
    case 'maximum':
      return `expected a number ≤ ${p.limit}`;
    case 'const':
      return `expected ${show(p.allowedValue)}`;
    default:
      return error.message ?? error.keyword;
  }
}

function dedupeAndSort(issues: FileIssue[]): FileIssue[] {
  const seen = new Set<string>();
  const unique = issues.filter((issue) => {
    const text = formatPolicyIssue(issue);
    if (seen.has(text)) return false;
    seen.add(text);
    return true;
  });
  return unique.sort((a, b) => (a.line ?? 0) - (b.line ?? 0) || (a.column ?? 0) - (b.column ?? 0));
}

/** Parses policy YAML text; `file` is used in messages. An empty document is the default policy. */
export function parsePolicy(text: string, file: string): GatePolicy {
  const { doc, lineCounter, issues: syntax } = parseSettingsYaml(text, file);
  if (syntax.length > 0) throw new PolicyError(syntax);
  const value: unknown = doc.toJS() ?? {};
  const validate = validator();
  if (!validate(value)) {
    const issues: FileIssue[] = [];
    for (const error of validate.errors ?? []) {
      const segments = pointerSegments(error.instancePath);
      if (error.keyword === 'unevaluatedProperties' || error.keyword === 'additionalProperties') {
        const key = String((error.params as Record<string, unknown>).unevaluatedProperty ?? (error.params as Record<string, unknown>).additionalProperty);
        const allowed = segments.length === 0 ? TOP_LEVEL_KEYS : GATE_RULE_NAMES;
        const pos = positionOf(doc, lineCounter, [...segments, key], 'key');
        issues.push({ file, line: pos?.line, column: pos?.col, path: [...segments, key].join('.'), message: `unknown key${didYouMean(key, allowed)}` });
      } else if (error.keyword === '$ref') {
        continue;
      } else {
        const pos = positionOf(doc, lineCounter, segments);
        const v = valueAt(value, segments);
        issues.push({ file, line: pos?.line, column: pos?.col, path: segments.join('.'), message: `${show(v)}: ${expectation(error)}` });
      }
    }
    throw new PolicyError(dedupeAndSort(issues));
  }
  const raw = value as Partial<GateRules> & { version?: 1; overrides?: Record<string, Partial<GateRules>> };
  const rules: GateRules = { ...DEFAULT_GATE_RULES };
  for (const name of GATE_RULE_NAMES) {
    if (raw[name] !== undefined) (rules as unknown as Record<string, unknown>)[name] = raw[name];
  }
  return { rules, overrides: raw.overrides ?? {}, file };
}

export function loadPolicy(file: string): GatePolicy {
  let text: string;
  try {
    text = readFileSync(file, 'utf8');
  } catch (error) {
    throw new PolicyError([{ file, path: '', message: `cannot read the policy file (${(error as NodeJS.ErrnoException).code ?? (error as Error).message})` }]);
  }
  return parsePolicy(text, file);
}
