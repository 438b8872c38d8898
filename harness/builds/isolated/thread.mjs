// Worker threads do not inherit the TypeScript loader: register it, then load the build thread.
import { register } from 'tsx/esm/api';

register();
await import('./thread.ts');
