// Worker threads do not inherit the main thread's TypeScript loader: register it here, then load
// the TypeScript side (loopTimeThread.ts), as ownThread.mjs does.
import { register } from 'tsx/esm/api';

register();
await import('./loopTimeThread.ts');
