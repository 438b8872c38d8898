// Worker threads do not inherit the main thread's TypeScript loader: register it here, then load
// the TypeScript side (ownThread.ts), as run/runThread.mjs does.
import { register } from 'tsx/esm/api';

register();
await import('./ownThread.ts');
