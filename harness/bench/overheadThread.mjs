// Worker threads do not inherit the main thread's TypeScript loader: register it here, then load
// the TypeScript side (overheadThread.ts), as run/runThread.mjs does.
import { register } from 'tsx/esm/api';

register();
await import('./overheadThread.ts');
