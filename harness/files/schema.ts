// JSON Schema validation of every file footing reads (scenarios, robots, gate policies, configs,
// results, bench figures): one Ajv (draft 2020-12) for all, each schema compiled once and kept.
// The options are the loosest any of the schemas needs at compile time; none changes what a
// document passes or fails: strictRequired/strictTypes off (if/then/else and allOf branches name
// fields declared beside them), union types allowed (scenario numbers that may also be strings),
// `format` as an annotation only (ajv-formats is not installed; results check their date
// themselves), and verbose errors (the scenario messages quote the offending value).

import { readFileSync } from 'node:fs';
import { Ajv2020, type ValidateFunction } from 'ajv/dist/2020.js';

let shared: Ajv2020 | undefined;
const added = new Map<string, string>();

function ajv(): Ajv2020 {
  shared ??= new Ajv2020({
    allErrors: true,
    verbose: true,
    strict: true,
    strictRequired: false,
    strictTypes: false,
    allowUnionTypes: true,
    validateFormats: false,
  });
  return shared;
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
  for (const reference of options.references ?? []) addSchemaFile(reference);
  const id = addSchemaFile(url);
  const validate = ajv().getSchema(`${id}${options.fragment ?? ''}`);
  if (validate === undefined) throw new Error(`schema ${url.href}${options.fragment ?? ''}: no such schema or definition`);
  return validate;
}
