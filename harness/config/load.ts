// Finding, parsing and validating footing.config.yaml. Errors name the file, line, column and
// dotted path, the value and what is expected, with a did-you-mean for misspelt keys and names —
// the same form as the gate policy's (harness/gate/policy.ts) and located with the same helper
// (positionOf, harness/files/source.ts).

import { existsSync, readFileSync } from 'node:fs';
import path from 'node:path';
import type { ErrorObject } from 'ajv/dist/2020.js';
import { stringify, type Document, type LineCounter } from 'yaml';
import { BuildSpecError, parseBuildSpec } from '../builds/spec.js';
import type { GatePolicy } from '../gate/defaults.js';
import { formatPolicyIssue, parsePolicy, POLICY_SCHEMA_URL } from '../gate/policy.js';
import { displayPath } from '../scenario/paths.js';
import { schemaValidator } from '../files/schema.js';
import { parseSettingsYaml, positionOf, valueAt } from '../files/source.js';
import { didYouMean } from '../files/suggest.js';
import { kindOf, pointerSegments, showValue, type FileIssue } from '../files/issue.js';
import { CONFIG_FILE_NAMES, type ConfigData, type GitBuildData } from './types.js';

export const CONFIG_SCHEMA_URL = new URL('./config.schema.json', import.meta.url);

export class ConfigError extends Error {
  constructor(readonly issues: FileIssue[]) {
    super(issues.map(formatPolicyIssue).join('\n'));
    this.name = 'ConfigError';
  }
}

export interface LoadedConfig {
  /** Absolute path of the file. */
  file: string;
  /** As shown in messages (relative to the working directory when inside it). */
  display: string;
  /** The project folder: relative paths in the file are relative to it. */
  dir: string;
  data: ConfigData;
  /** `file:line:col` of a dotted path in the file (the file alone when it has no position). */
  where(segments: readonly (string | number)[], options?: { key?: boolean }): { line?: number; col?: number; label: string };
  /** The inline gate policy, parsed (undefined when `gate` is a path or absent). */
  inlinePolicy?: GatePolicy;
}

const validator = () => schemaValidator(CONFIG_SCHEMA_URL, { references: [POLICY_SCHEMA_URL] });

/** The config file to use: `--config FILE`, else footing.config.yaml in `cwd`; null when there is none. */
export function findConfigFile(cwd: string, given?: string): string | null {
  if (given !== undefined) return path.resolve(cwd, given);
  for (const name of CONFIG_FILE_NAMES) {
    const candidate = path.join(cwd, name);
    if (existsSync(candidate)) return candidate;
  }
  return null;
}

export function loadConfig(file: string, cwd = process.cwd()): LoadedConfig {
  const display = displayPath(file, cwd);
  let text: string;
  try {
    text = readFileSync(file, 'utf8');
  } catch (error) {
    throw new ConfigError([{ file: display, path: '', message: `cannot read the config file (${(error as NodeJS.ErrnoException).code ?? (error as Error).message})` }]);
  }
  return parseConfig(text, file, cwd);
}

/** Parses config text; `file` (absolute) names it in messages and anchors its relative paths. */
export function parseConfig(text: string, file: string, cwd = process.cwd()): LoadedConfig {
  const display = displayPath(file, cwd);
  const { doc, lineCounter, issues: syntax } = parseSettingsYaml(text, display);
  if (syntax.length > 0) throw new ConfigError(syntax);
  const value: unknown = doc.toJS() ?? {};
  const where = (segments: readonly (string | number)[], options: { key?: boolean } = {}) => {
    const pos = positionOf(doc, lineCounter, segments.map(String), options.key ? 'key' : 'value');
    return { line: pos?.line, col: pos?.col, label: pos ? `${display}:${pos.line}:${pos.col}` : display };
  };
  const validate = validator();
  if (!validate(value)) throw new ConfigError(sortIssues(translate(validate.errors ?? [], value, doc, lineCounter, display)));
  const data = value as ConfigData;
  const loaded: LoadedConfig = { file, display, dir: path.dirname(file), data, where };
  const issues = checkReferences(loaded);
  if (typeof data.gate === 'object' && data.gate !== null) {
    // Already validated against the policy schema above; parsePolicy fills the defaults.
    loaded.inlinePolicy = parsePolicy(stringify(data.gate), `${display} (gate)`);
  }
  if (issues.length > 0) throw new ConfigError(sortIssues(issues));
  return loaded;
}

/** Names used across sections must exist: suite builds, baselines, and what git:REF builds need. */
function checkReferences(config: LoadedConfig): FileIssue[] {
  const { data, display } = config;
  const issues: FileIssue[] = [];
  const issue = (segments: (string | number)[], message: string, key = false) => {
    const pos = config.where(segments, { key });
    issues.push({ file: display, line: pos.line, column: pos.col, path: segments.join('.'), message });
  };
  const buildNames = Object.keys(data.builds ?? {});
  const known = (name: string) => buildNames.includes(name);
  const unknownBuild = (name: string) =>
    buildNames.length === 0
      ? `no build "${name}": the file has no builds section (add builds: { ${name}: … })`
      : `no build "${name}" in the builds section${didYouMean(name, buildNames)}`;

  if (data.baseline !== undefined && buildNames.length > 0 && !known(data.baseline)) issue(['baseline'], unknownBuild(data.baseline));
  for (const [suiteName, suite] of Object.entries(data.suites ?? {})) {
    if (Array.isArray(suite)) continue;
    (suite.builds ?? []).forEach((name, i) => {
      if (!known(name)) issue(['suites', suiteName, 'builds', i], unknownBuild(name));
    });
    if (suite.baseline !== undefined) {
      const members = suite.builds ?? buildNames;
      if (!members.includes(suite.baseline)) {
        issue(['suites', suiteName, 'baseline'], suite.builds ? `"${suite.baseline}" is not one of this suite's builds (${suite.builds.join(', ')})${didYouMean(suite.baseline, suite.builds)}` : unknownBuild(suite.baseline));
      }
    }
  }
  for (const [name, build] of Object.entries(data.builds ?? {})) {
    if (typeof build === 'string') {
      const ref = gitRefOfSpec(build);
      if (ref !== null) {
        if (ref === '') issue(['builds', name], `"${build}": expected git:REF with a branch, tag or commit after "git:"`);
        else if (data.git?.entry === undefined) issue(['builds', name], `"${build}" needs the git section's entry (git: { build: …, entry: … }) to know what to load from the worktree`);
        continue;
      }
      try {
        parseBuildSpec(`${name}=${build}`, config.dir);
      } catch (error) {
        if (error instanceof BuildSpecError) issue(['builds', name], error.problem);
        else throw error;
      }
    } else if (recipeOf(data, build).entry === undefined) {
      issue(['builds', name], 'a git build needs an entry (here or in the git section): the module or program to load from the worktree');
    }
  }
  if (typeof data.gate === 'string' && !existsSync(path.resolve(config.dir, data.gate))) {
    issue(['gate'], `policy file ${showValue(data.gate)} does not exist (looked for ${path.resolve(config.dir, data.gate)}; paths are relative to ${display})`);
  }
  return issues;
}

/** The ref of a `git:REF` spec string (possibly ''), or null for other specs. */
export function gitRefOfSpec(spec: string): string | null {
  const body = spec.trim();
  return body.startsWith('git:') ? body.slice(4).trim() : null;
}

/** A git build's recipe: its own fields over the git section's. */
export function recipeOf(data: ConfigData, build: Partial<GitBuildData>): GitBuildData & { kind: 'module' | 'process' } {
  const base = data.git ?? {};
  const entry = build.entry ?? base.entry;
  return {
    ref: build.ref ?? '',
    repo: build.repo ?? base.repo,
    build: build.build ?? base.build,
    entry,
    kind: build.kind ?? base.kind ?? (entry !== undefined && /\.([mc]?js|[mc]?ts)$/.test(entry) ? 'module' : 'process'),
    args: build.args ?? base.args,
    options: { ...(base.options ?? {}), ...(build.options ?? {}) },
  };
}

// --- ajv errors → issues -------------------------------------------------------------------

function knownKeys(schema: unknown): string[] {
  const properties = (schema as { properties?: Record<string, unknown> } | undefined)?.properties;
  return properties ? Object.keys(properties) : [];
}

function translate(errors: ErrorObject[], value: unknown, doc: Document, lineCounter: LineCounter, file: string): FileIssue[] {
  const issues: FileIssue[] = [];
  const seen = new Set<string>();
  const push = (segments: string[], message: string, key = false) => {
    const pos = positionOf(doc, lineCounter, segments, key ? 'key' : 'value');
    const issue = { file, line: pos?.line, column: pos?.col, path: segments.join('.'), message };
    const text = formatPolicyIssue(issue);
    if (!seen.has(text)) {
      seen.add(text);
      issues.push(issue);
    }
  };
  for (const error of errors) {
    const segments = pointerSegments(error.instancePath);
    const params = error.params as Record<string, unknown>;
    const v = valueAt(value, segments);
    switch (error.keyword) {
      case 'additionalProperties':
      case 'unevaluatedProperties': {
        const name = String(params.additionalProperty ?? params.unevaluatedProperty);
        const known = knownKeys(error.parentSchema);
        // The gate policy's rule keys live in a $ref'd definition; ajv's parent schema there is the
        // top of the policy schema, so list the keys of both.
        const ruleKeys = knownKeys((error.parentSchema as { $defs?: { rules?: unknown } } | undefined)?.$defs?.rules);
        push([...segments, name], `unknown key${didYouMean(name, [...known, ...ruleKeys])}`, true);
        break;
      }
      case 'required':
        push(segments, `missing ${String(params.missingProperty)}`);
        break;
      case 'type': {
        const expected = String(params.type).split(',').map((t) => (t === 'object' ? 'a mapping' : t === 'array' ? 'a list' : t === 'boolean' ? 'true or false' : t === 'integer' ? 'an integer' : `a ${t}`)).join(' or ');
        push(segments, `${showValue(v)} is ${kindOf(v)}, expected ${expected}`);
        break;
      }
      case 'enum':
        push(segments, `${showValue(v)} is not one of ${(params.allowedValues as unknown[]).map((a) => JSON.stringify(a)).join(', ')}${typeof v === 'string' ? didYouMean(v, (params.allowedValues as unknown[]).map(String)).replace(/; known: .*/, '') : ''}`);
        break;
      case 'const':
        push(segments, `${showValue(v)}: expected ${showValue(params.allowedValue)}`);
        break;
      case 'minimum':
      case 'exclusiveMinimum':
        push(segments, `${showValue(v)} is out of range (expected ${String(params.comparison).replace('>=', '≥')} ${String(params.limit)})`);
        break;
      case 'minItems':
        push(segments, `is an empty list (expected at least ${String(params.limit)} item${params.limit === 1 ? '' : 's'})`);
        break;
      case 'minLength':
        push(segments, `is empty (expected a non-empty string)`);
        break;
      case 'pattern':
        if (error.propertyName !== undefined) {
          push([...segments, error.propertyName], `"${error.propertyName}" is not a valid name (expected letters, digits, '.', '_' and '-')`, true);
        } else {
          push(segments, `${showValue(v)} is not a valid name (expected letters, digits, '.', '_' and '-')`);
        }
        break;
      case 'if':
      case 'propertyNames':
      case '$ref':
        break;
      default:
        push(segments, `${showValue(v)}: ${error.message ?? error.keyword}`);
    }
  }
  return issues;
}

function sortIssues(issues: FileIssue[]): FileIssue[] {
  return [...issues].sort((a, b) => (a.line ?? 0) - (b.line ?? 0) || (a.column ?? 0) - (b.column ?? 0));
}
