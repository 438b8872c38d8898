// Build specs as written on the command line, parsed into plain data. Parsing is pure (no file
// system access): whether a module exists is checked when the build is opened (loader.ts).
//
// Grammar (documented for users in docs/protocol.md, "Build specs"):
//   name=path/to/module.js[?options]          in-process module (.js .mjs .cjs .ts .mts .cts)
//   name=exec:program arg1 "arg 2" … [?options] out-of-process build, arguments split without a shell
//   ref:<id>[?options]  or  name=ref:<id>[?options]   bundled reference build
// options: `key=value` pairs joined by `&`, URL-decoded; values `true`/`false` become booleans,
// numbers become numbers, everything else stays a string.

import { isAbsolute, resolve } from 'node:path';
import { suggestName } from '../files/suggest.js';

export type BuildKind = 'module' | 'process' | 'reference';

export const REFERENCE_BUILD_IDS = ['nominal', 'governed', 'clamped', 'qp', 'overtrusting'] as const;
export type ReferenceBuildId = (typeof REFERENCE_BUILD_IDS)[number];

/**
 * What run, margin and bench use when no build is named: the four reference controllers of
 * docs/reference-controllers.md (the demo-only over-trusting build is left out).
 */
export const DEFAULT_REFERENCE_BUILDS: readonly ReferenceBuildId[] = ['nominal', 'governed', 'clamped', 'qp'];
export const DEFAULT_BUILDS: readonly string[] = DEFAULT_REFERENCE_BUILDS.map((id) => `ref:${id}`);

export const MODULE_EXTENSIONS = ['.js', '.mjs', '.cjs', '.ts', '.mts', '.cts'] as const;

export type BuildOptionValue = string | number | boolean;

export interface BuildSpec {
  /** Letters, digits, `.`, `_`, `-`; the key of this build in results. */
  name: string;
  kind: BuildKind;
  /**
   * module: absolute path of the module; process: the program (absolute when it contains a `/`,
   * else a command name looked up on PATH); reference: the reference id.
   */
  entry: string;
  /** Program arguments (process builds); empty otherwise. */
  args: string[];
  /** Passed to the build: ControllerSetup.options in-process, `options` of the hello message. */
  options: Record<string, BuildOptionValue>;
  /** Working directory the spec was written in; process builds run here. */
  cwd: string;
  /** The spec text as given, for messages and results. */
  text: string;
}

export class BuildSpecError extends Error {
  constructor(
    readonly specText: string,
    readonly problem: string,
  ) {
    super(`build spec '${specText}': ${problem}`);
    this.name = 'BuildSpecError';
  }
}

const NAME_PATTERN = /^[A-Za-z0-9._-]+$/;
const OPTION_KEY_PATTERN = /^[A-Za-z_][A-Za-z0-9._-]*$/;
const FORMS =
  'expected name=path/to/module.js, name=exec:program arg…, ref:<id> or name=ref:<id> ' +
  `(reference ids: ${REFERENCE_BUILD_IDS.join(', ')})`;

export function parseBuildSpec(text: string, cwd: string): BuildSpec {
  const fail = (problem: string): never => {
    throw new BuildSpecError(text, problem);
  };
  const trimmed = text.trim();
  if (trimmed === '') fail(`empty spec; ${FORMS}`);

  let name: string | null = null;
  let body = trimmed;
  if (!trimmed.startsWith('ref:')) {
    const eq = trimmed.indexOf('=');
    if (eq < 0) fail(`no build name; ${FORMS}`);
    name = trimmed.slice(0, eq);
    body = trimmed.slice(eq + 1);
    if (name === '') fail(`empty build name before '='; ${FORMS}`);
    if (!NAME_PATTERN.test(name)) {
      fail(`build name '${name}' may contain only letters, digits, '.', '_' and '-'`);
    }
    if (body.trim() === '') fail(`nothing after '${name}='; ${FORMS}`);
  }

  if (body.startsWith('ref:')) {
    const { head, options } = splitOptions(body.slice(4), fail);
    const id = head.trim();
    if (!(REFERENCE_BUILD_IDS as readonly string[]).includes(id)) {
      const guess = suggestName(id, REFERENCE_BUILD_IDS);
      fail(`unknown reference build '${id}'${guess === undefined ? '' : `; did you mean 'ref:${guess}'?`} (expected one of ${REFERENCE_BUILD_IDS.join(', ')})`);
    }
    return { name: name ?? id, kind: 'reference', entry: id, args: [], options, cwd, text };
  }

  // Only ref: specs may omit the name, so name is set from here on.
  const buildName = name as string;

  if (body.startsWith('git:')) {
    // Resolved before parsing, by the config layer (harness/config/builds.ts), which knows the
    // repository, the build command and the entry; reaching here means there was no config.
    fail(`git:REF builds need a recipe (repository, build command, entry) from footing.config.yaml's \`git\` section; see docs/config.md`);
  }

  if (body.startsWith('exec:')) {
    const tokens = splitArguments(body.slice(5), fail);
    let options: Record<string, BuildOptionValue> = {};
    const last = tokens[tokens.length - 1];
    if (last !== undefined && !last.quoted && last.value.startsWith('?')) {
      options = parseOptions(last.value.slice(1), fail);
      tokens.pop();
    }
    if (tokens.length === 0) fail(`exec: needs a program, e.g. ${buildName}=exec:python3 controller.py`);
    const program = tokens[0].value;
    const entry = program.includes('/') && !isAbsolute(program) ? resolve(cwd, program) : program;
    return {
      name: buildName,
      kind: 'process',
      entry,
      args: tokens.slice(1).map((token) => token.value),
      options,
      cwd,
      text,
    };
  }

  const { head, options } = splitOptions(body, fail);
  const path = head.trim();
  const extension = MODULE_EXTENSIONS.find((ext) => path.endsWith(ext));
  if (extension === undefined) {
    fail(
      `module '${path}' must end in ${MODULE_EXTENSIONS.join(', ')}; ` +
        `for a program in another language write ${buildName}=exec:program arg…`,
    );
  }
  return {
    name: buildName,
    kind: 'module',
    entry: resolve(cwd, path),
    args: [],
    options,
    cwd,
    text,
  };
}

/** `head?k=v&…` → head and options; the last `?` starts the options. */
function splitOptions(
  body: string,
  fail: (problem: string) => never,
): { head: string; options: Record<string, BuildOptionValue> } {
  const q = body.lastIndexOf('?');
  if (q < 0) return { head: body, options: {} };
  return { head: body.slice(0, q), options: parseOptions(body.slice(q + 1), fail) };
}

function parseOptions(
  query: string,
  fail: (problem: string) => never,
): Record<string, BuildOptionValue> {
  const options: Record<string, BuildOptionValue> = {};
  if (query === '') return options;
  for (const pair of query.split('&')) {
    const eq = pair.indexOf('=');
    if (eq <= 0) fail(`option '${pair}' must be key=value (options are ?key=value&key2=value2)`);
    const key = pair.slice(0, eq);
    if (!OPTION_KEY_PATTERN.test(key)) {
      fail(`option key '${key}' must start with a letter or '_' and contain letters, digits, '.', '_', '-'`);
    }
    if (Object.prototype.hasOwnProperty.call(options, key)) fail(`option '${key}' is given twice`);
    let raw: string;
    try {
      raw = decodeURIComponent(pair.slice(eq + 1));
    } catch {
      return fail(`option '${key}' has a broken %-escape in '${pair.slice(eq + 1)}'`);
    }
    options[key] = typeOptionValue(raw);
  }
  return options;
}

function typeOptionValue(raw: string): BuildOptionValue {
  if (raw === 'true') return true;
  if (raw === 'false') return false;
  // Number() accepts '', ' ', '0x10' and 'Infinity'; only plain decimal literals become numbers.
  if (/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(raw)) return Number(raw);
  return raw;
}

export interface ArgumentToken {
  value: string;
  /** Some part of the token was quoted or escaped (so it is never read as the options token). */
  quoted: boolean;
}

/**
 * Splits a command line the way a POSIX shell splits words, without any expansion: whitespace
 * separates, '…' is literal, "…" allows \" and \\ escapes, a backslash outside quotes escapes the
 * next character.
 */
export function splitArguments(line: string, fail: (problem: string) => never): ArgumentToken[] {
  const tokens: ArgumentToken[] = [];
  let value = '';
  let quoted = false;
  let inToken = false;
  let i = 0;
  while (i < line.length) {
    const c = line[i];
    if (c === ' ' || c === '\t' || c === '\n') {
      if (inToken) tokens.push({ value, quoted });
      value = '';
      quoted = false;
      inToken = false;
      i++;
      continue;
    }
    inToken = true;
    if (c === "'") {
      const end = line.indexOf("'", i + 1);
      if (end < 0) fail(`unterminated ' quote starting at column ${i + 1} of the exec: arguments`);
      value += line.slice(i + 1, end);
      quoted = true;
      i = end + 1;
    } else if (c === '"') {
      quoted = true;
      i++;
      let closed = false;
      while (i < line.length) {
        const d = line[i];
        if (d === '"') {
          closed = true;
          i++;
          break;
        }
        if (d === '\\' && (line[i + 1] === '"' || line[i + 1] === '\\')) {
          value += line[i + 1];
          i += 2;
        } else {
          value += d;
          i++;
        }
      }
      if (!closed) fail('unterminated " quote in the exec: arguments');
    } else if (c === '\\') {
      if (i + 1 >= line.length) fail('a trailing backslash in the exec: arguments escapes nothing');
      value += line[i + 1];
      quoted = true;
      i += 2;
    } else {
      value += c;
      i++;
    }
  }
  if (inToken) tokens.push({ value, quoted });
  return tokens;
}
