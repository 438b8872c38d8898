#!/usr/bin/env node
// Entry point: registers the TypeScript loader, then hands over to the thin CLI layer.
import { register } from 'tsx/esm/api';

register();
// `footing … | head` closes the pipe early: that is the reader's choice, not an error to report.
for (const stream of [process.stdout, process.stderr]) {
  stream.on('error', (error) => {
    if (error.code === 'EPIPE') process.exit(process.exitCode ?? 0);
    throw error;
  });
}
const { main } = await import('../harness/cli/main.ts');
process.exitCode = await main(process.argv.slice(2));
