// What code a build runs, as one hash: the files themselves, not their names or timestamps. A saved
// run is reused (`--resume`) only while this hash is unchanged, so editing a controller module, one
// of its local imports, the program of a process build or the script it runs reruns that build.
//
// What is hashed, per kind:
//   module     the module file and, recursively, every local file it imports (relative specifiers
//              in import/export statements and import() calls; `.js` resolves to the `.ts` beside it
//              as TypeScript's NodeNext convention has it);
//   process    the program file (looked up on PATH when it names a command) and every argument that
//              names an existing file (e.g. the script of `exec:python3 ctl.py`) — a script's own
//              imports are not followed (their syntax is the script language's);
//   reference  the bundled reference controllers: the import closure of harness/builds/reference.
// Plus the spec's arguments and options, which change what the same code does.

import { createHash } from 'node:crypto';
import { existsSync, readFileSync, statSync } from 'node:fs';
import { delimiter, dirname, isAbsolute, join, relative, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { BuildSpec } from './spec.js';

export interface BuildContentIdentity {
  /**
   * sha256 over the kind, options, arguments and every file's content and path relative to the
   * first file's folder (so two clones of one commit agree).
   */
  sha256: string;
  /** Files hashed, in the order hashed (absolute paths). */
  files: string[];
}

/** A module graph larger than this is hashed up to here and marked (no controller needs more). */
const MAX_FILES = 2000;

const REFERENCE_ENTRY = join(dirname(fileURLToPath(import.meta.url)), 'reference', 'index.ts');

// import x from './a.js'; export * from "../b"; import('./c.js'); import './d.js'
const LOCAL_SPECIFIER = /(?:\bfrom\s*|\bimport\s*\(\s*|\bimport\s+)(['"])(\.{1,2}\/[^'"\n]+)\1/g;

function resolveLocal(fromFile: string, specifier: string): string | null {
  const base = resolve(dirname(fromFile), specifier);
  const tries = [base];
  if (/\.(m|c)?js$/.test(base)) tries.push(base.replace(/\.js$/, '.ts').replace(/\.mjs$/, '.mts').replace(/\.cjs$/, '.cts'));
  tries.push(`${base}.ts`, `${base}.js`, join(base, 'index.ts'), join(base, 'index.js'));
  for (const candidate of tries) {
    if (existsSync(candidate) && statSync(candidate).isFile()) return candidate;
  }
  return null;
}

/** The module file and its local import closure, breadth first, each file once. */
export function localImportClosure(entry: string): string[] {
  const seen = new Set<string>([entry]);
  const order = [entry];
  for (let k = 0; k < order.length && order.length < MAX_FILES; k++) {
    let text: string;
    try {
      text = readFileSync(order[k], 'utf8');
    } catch {
      continue;
    }
    for (const match of text.matchAll(LOCAL_SPECIFIER)) {
      const target = resolveLocal(order[k], match[2]);
      if (target !== null && !seen.has(target)) {
        seen.add(target);
        order.push(target);
      }
    }
  }
  return order;
}

/** A command name looked up on PATH as a shell would (first executable match). */
export function whichProgram(program: string, cwd: string): string | null {
  if (program.includes('/')) {
    const path = isAbsolute(program) ? program : resolve(cwd, program);
    return existsSync(path) ? path : null;
  }
  for (const folder of (process.env.PATH ?? '').split(delimiter)) {
    if (folder === '') continue;
    const candidate = join(folder, program);
    if (existsSync(candidate) && statSync(candidate).isFile()) return candidate;
  }
  return null;
}

function filesOf(spec: BuildSpec): string[] {
  switch (spec.kind) {
    case 'module':
      return existsSync(spec.entry) ? localImportClosure(spec.entry) : [];
    case 'reference':
      return localImportClosure(REFERENCE_ENTRY);
    case 'process': {
      const files: string[] = [];
      const program = whichProgram(spec.entry, spec.cwd);
      if (program !== null) files.push(program);
      for (const arg of spec.args) {
        if (arg.startsWith('-')) continue;
        const candidate = resolve(spec.cwd, arg);
        if (existsSync(candidate) && statSync(candidate).isFile() && !files.includes(candidate)) files.push(candidate);
      }
      return files;
    }
  }
}

export function buildContentIdentity(spec: BuildSpec): BuildContentIdentity {
  const files = filesOf(spec);
  const root = files.length > 0 ? dirname(files[0]) : spec.cwd;
  const hash = createHash('sha256');
  hash.update(JSON.stringify({ kind: spec.kind, entry: spec.kind === 'reference' ? spec.entry : '', args: spec.args, options: spec.options }));
  for (const file of files) {
    hash.update('\0file\0');
    hash.update(relative(root, file));
    hash.update('\0');
    try {
      hash.update(readFileSync(file));
    } catch (error) {
      hash.update(`unreadable: ${(error as NodeJS.ErrnoException).code ?? 'error'}`);
    }
  }
  if (files.length >= MAX_FILES) hash.update('\0truncated');
  return { sha256: hash.digest('hex'), files };
}
