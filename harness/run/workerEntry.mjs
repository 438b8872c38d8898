// Worker threads do not inherit the main thread's TypeScript loader: register it here, then load
// the TypeScript worker. Plain JavaScript so that Node can start it without a loader.
import { register } from 'tsx/esm/api';

register();
const worker = await import('./worker.ts');

export default worker.default;
