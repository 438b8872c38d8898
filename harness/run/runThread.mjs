// Worker threads do not inherit the main thread's TypeScript loader: register it here, then load
// the TypeScript side (runThread.ts). Plain JavaScript so that Node can start it without a loader.
import { register } from 'tsx/esm/api';

register();
await import('./runThread.ts');
