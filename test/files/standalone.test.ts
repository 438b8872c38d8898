// The validators generated ahead of time (files/standalone.ts, used by the compiled build) are the
// validators Ajv compiles at run time (files/schema.ts, used from the sources): same verdict and the
// same error objects — so the same messages — on good files and on broken ones.

import { mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { describe, expect, it } from 'vitest';
import { parse } from 'yaml';
import { createAjv } from '../../harness/files/schema.js';
import { generateValidatorModule, PRECOMPILED_FRAGMENTS } from '../../harness/files/standalone.js';

type Validate = ((data: unknown) => boolean) & { errors?: unknown };

function schemaFiles(folder: string): string[] {
  return readdirSync(folder, { withFileTypes: true }).flatMap((entry) => {
    const file = path.join(folder, entry.name);
    return entry.isDirectory() ? schemaFiles(file) : file.endsWith('.schema.json') ? [file] : [];
  });
}

const files = schemaFiles('harness').sort();

/** Each bundled YAML document plus three breakages of it: a field gone, a wrong type, an unknown field. */
function documents(): unknown[] {
  const docs: unknown[] = [{}, [], 'text', { version: 'x', unknownField: 1 }];
  for (const folder of ['scenarios', 'scenarios/robots']) {
    for (const name of readdirSync(folder).filter((n) => n.endsWith('.yaml'))) {
      const doc = parse(readFileSync(path.join(folder, name), 'utf8')) as Record<string, unknown>;
      const keys = Object.keys(doc);
      docs.push(doc, { ...doc, surplus: true });
      if (keys.length > 0) {
        const { [keys[0]]: _gone, ...rest } = doc;
        docs.push(rest, { ...doc, [keys[keys.length - 1]]: 'not-this' });
      }
    }
  }
  return docs;
}

describe('validators compiled ahead of time', async () => {
  const out = path.resolve('test/.artifacts');
  mkdirSync(out, { recursive: true });
  // Inside the repository so the generated code's require('ajv/dist/runtime/…') resolves.
  const file = path.join(out, 'validators.generated.test.cjs');
  writeFileSync(file, await generateValidatorModule(files));
  const generated = createRequire(pathToFileURL(file))(file) as { index: Record<string, string> } & Record<string, Validate>;
  const runtime = createAjv();
  for (const schemaFile of files) runtime.addSchema(JSON.parse(readFileSync(schemaFile, 'utf8')));

  const keys = files.flatMap((schemaFile) => {
    const id = (JSON.parse(readFileSync(schemaFile, 'utf8')) as { $id: string }).$id;
    return [id, ...(PRECOMPILED_FRAGMENTS[id] ?? []).map((fragment) => `${id}${fragment}`)];
  });

  it('covers every schema file of the harness and each listed fragment', () => {
    expect(files.length).toBeGreaterThanOrEqual(6);
    expect(Object.keys(generated.index).sort()).toEqual([...keys].sort());
  });

  it.each(keys)('%s: same verdict and same errors as the run-time compiled validator', (key) => {
    const ahead = generated[generated.index[key]];
    const atRunTime = runtime.getSchema(key) as Validate;
    let failures = 0;
    for (const doc of documents()) {
      const verdict = ahead(doc);
      expect(verdict).toBe(atRunTime(doc));
      expect(ahead.errors ?? null).toEqual(atRunTime.errors ?? null);
      if (!verdict) failures++;
    }
    expect(failures).toBeGreaterThan(0); // the broken documents were refused, so errors were compared
  });
});
