// JSON Schema validation of every file footing reads (scenarios, robots, gate policies, configs,
// results, bench figures): one Ajv (draft 2020-12) for all, each schema compiled once and kept.
// The options are the loosest any of the schemas needs at compile time; none changes what a
// document passes or fails: strictRequired/strictTypes off (if/then/else and allOf branches name
// fields declared beside them), union types allowed (scenario numbers that may also be strings),
// `format` as an annotation only (ajv-formats is not installed; results check their date
// themselves), and verbose errors (the scenario messages quote the offending value).
//
// Compiling the schemas costs a few hundred ms per process (and per worker thread), so the
// compiled build (`npm run build`, scripts/build.mjs) generates the same validators ahead of time
// with Ajv's standalone code generation (files/standalone.ts) into validators.generated.cjs beside
// this file. When that file is there (the compiled build) it is used; from the TypeScript sources
// (tests, a checkout without a build) Ajv compiles at first use, with the same options, so the
// errors are the same objects either way (test/files/standalone.test.ts).

import { existsSync, readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import type { Ajv2020, ValidateFunction } from 'ajv/dist/2020.js';

const require = createRequire(import.meta.url);

/** The options of the one Ajv instance; standalone.ts generates with these too. */
export const AJV_OPTIONS = Object.freeze({
  allErrors: true,
  verbose: true,
  strict: true,
  strictRequired: false,
  strictTypes: false,
  allowUnionTypes: true,
  validateFormats: false,
});

/** Generated module: `index` maps "$id#fragment" keys to export names. */
interface Precompiled {
  index: Record<string, string>;
  [exportName: string]: unknown;
}

const PRECOMPILED_URL = new URL('./validators.generated.cjs', import.meta.url);
let precompiled: Precompiled | null | undefined;

function precompiledValidators(): Precompiled | null {
  if (precompiled === undefined) {
    precompiled = process.env.FOOTING_RUNTIME_SCHEMAS !== '1' && existsSync(PRECOMPILED_URL) ? (require(PRECOMPILED_URL.pathname) as Precompiled) : null;
  }
  return precompiled;
}

let shared: Ajv2020 | undefined;
const added = new Map<string, string>();

/** A fresh Ajv with the shared options (plus `extra`, e.g. code generation). Loaded on demand. */
export function createAjv(extra: Record<string, unknown> = {}): Ajv2020 {
  const { Ajv2020: AjvClass } = require('ajv/dist/2020.js') as typeof import('ajv/dist/2020.js');
  return new AjvClass({ ...AJV_OPTIONS, ...extra });
}

function ajv(): Ajv2020 {
  shared ??= createAjv();
  return shared;
}

/** The $id of a schema file (read once). */
const ids = new Map<string, string>();
function schemaId(url: URL): string {
  let id = ids.get(url.href);
  if (id === undefined) {
    id = (JSON.parse(readFileSync(url, 'utf8')) as { $id?: string }).$id ?? url.href;
    ids.set(url.href, id);
  }
  return id;
}

/** Adds the schema file once; returns its $id. */
function addSchemaFile(url: URL): string {
  const known = added.get(url.href);
  if (known !== undefined) return known;
  const schema = JSON.parse(readFileSync(url, 'utf8')) as { $id?: string };
  const id = schema.$id ?? url.href;
  ajv().addSchema(schema, schema.$id === undefined ? id : undefined);
  added.set(url.href, id);
  return id;
}

/**
 * The compiled validator of a schema file (or of one of its definitions, `fragment` such as
 * `#/$defs/matrix`). `references` are schema files it `$ref`s by id, added first.
 */
export function schemaValidator(url: URL, options: { fragment?: string; references?: readonly URL[] } = {}): ValidateFunction {
  const ahead = precompiledValidators();
  if (ahead !== null) {
    const exportName = ahead.index[`${schemaId(url)}${options.fragment ?? ''}`];
    if (exportName !== undefined) return ahead[exportName] as ValidateFunction;
  }
  for (const reference of options.references ?? []) addSchemaFile(reference);
  const id = addSchemaFile(url);
  const validate = ajv().getSchema(`${id}${options.fragment ?? ''}`);
  if (validate === undefined) throw new Error(`schema ${url.href}${options.fragment ?? ''}: no such schema or definition`);
  return validate;
}
