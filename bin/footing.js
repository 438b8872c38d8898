#!/usr/bin/env node
// Entry point: registers the TypeScript loader, then hands over to the thin CLI layer.
import { register } from 'tsx/esm/api';

register();
const { main } = await import('../harness/cli/main.ts');
process.exitCode = await main(process.argv.slice(2));
