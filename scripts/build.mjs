#!/usr/bin/env node
// The compiled build: harness/**/*.ts → dist/**/*.js (tsc, tsconfig.build.json), the schema files
// copied beside their modules, the ahead-of-time validators (dist/files/validators.generated.cjs)
// and the report's precompiled templates (dist/report/templates.generated.cjs).
// dist/ mirrors harness/ at the same depth, so every `new URL('../../…', import.meta.url)` names
// the same repository file from either. Run by `npm ci` (prepare) and `npm test`; bin/footing.js
// uses dist/ when it is there and falls back to the TypeScript sources when it is not.
import { spawnSync } from 'node:child_process';
import { copyFileSync, mkdirSync, readdirSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join, relative } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { newest } from '../bin/sourcesMtime.js';

const root = fileURLToPath(new URL('../', import.meta.url));
const source = join(root, 'harness');
const out = join(root, 'dist');

rmSync(out, { recursive: true, force: true });
// The newest source time, taken before compiling: an edit made during the build leaves dist/ stale.
const sourcesMtime = newest(source);
const tsc = createRequire(import.meta.url).resolve('typescript/bin/tsc');
// --noCheck: emit only; the type-check is `npm run typecheck` (and the first step of `npm test`).
const compiled = spawnSync(process.execPath, [tsc, '-p', join(root, 'tsconfig.build.json'), '--noCheck'], { stdio: 'inherit' });
if (compiled.status !== 0) {
  rmSync(out, { recursive: true, force: true });
  console.error('footing build: tsc failed; dist/ removed (bin/footing.js runs the TypeScript sources)');
  process.exit(compiled.status ?? 1);
}

function* files(folder) {
  for (const entry of readdirSync(folder, { withFileTypes: true })) {
    const path = join(folder, entry.name);
    if (entry.isDirectory()) yield* files(path);
    else yield path;
  }
}
const schemas = [];
for (const file of files(source)) {
  if (!file.endsWith('.json')) continue;
  const target = join(out, relative(source, file));
  mkdirSync(dirname(target), { recursive: true });
  copyFileSync(file, target);
  if (file.endsWith('.schema.json')) schemas.push(file);
}

const { generateValidatorModule } = await import(pathToFileURL(join(out, 'files', 'standalone.js')).href);
const target = join(out, 'files', 'validators.generated.cjs');
writeFileSync(`${target}.tmp`, await generateValidatorModule(schemas.sort()));
renameSync(`${target}.tmp`, target);
// The report's handlebars templates, precompiled (harness/report/render.ts checks their digest).
const { precompiledTemplatesModule } = await import(pathToFileURL(join(out, 'report', 'render.js')).href);
const templates = join(out, 'report', 'templates.generated.cjs');
writeFileSync(`${templates}.tmp`, precompiledTemplatesModule());
renameSync(`${templates}.tmp`, templates);
writeFileSync(join(out, '.sources-mtime'), String(sourcesMtime));
console.error(`footing build: dist/ (${schemas.length} schemas and the report templates compiled ahead of time)`);
