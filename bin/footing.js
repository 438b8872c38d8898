#!/usr/bin/env node
// Entry point: the compiled build (dist/, made by `npm ci` / `npm run build`) when it is there and
// no source file under harness/ is newer than it (an edited checkout never runs stale code);
// otherwise the TypeScript sources through the tsx loader. FOOTING_SOURCE=1 forces the sources.
import { existsSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { newest } from './sourcesMtime.js';

// `footing … | head` closes the pipe early: that is the reader's choice, not an error to report.
for (const stream of [process.stdout, process.stderr]) {
  stream.on('error', (error) => {
    if (error.code === 'EPIPE') process.exit(process.exitCode ?? 0);
    throw error;
  });
}
const compiled = new URL('../dist/cli/main.js', import.meta.url);
const stamp = new URL('../dist/.sources-mtime', import.meta.url);


function compiledIsCurrent() {
  if (process.env.FOOTING_SOURCE === '1' || !existsSync(compiled) || !existsSync(stamp)) return false;
  return newest(fileURLToPath(new URL('../harness/', import.meta.url))) <= Number(readFileSync(stamp, 'utf8'));
}

let main;
if (compiledIsCurrent()) {
  ({ main } = await import(compiled.href));
} else {
  const { register } = await import('tsx/esm/api');
  register();
  ({ main } = await import('../harness/cli/main.ts'));
}
process.exitCode = await main(process.argv.slice(2));
