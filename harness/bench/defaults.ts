// What the bench measures when not told otherwise: the bundled scenario and the standard builds.
// `footing bench` and `footing run --bench` both use these.

import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { DEFAULT_BUILDS, parseBuildSpec, type BuildSpec } from '../builds/spec.js';

/** The repository root (where scenarios/ and examples/ live). */
const PACKAGE_ROOT = fileURLToPath(new URL('../../', import.meta.url));

/** The bundled default scenario: flat, dry, stand → trot → stand, so every code path runs. */
export const DEFAULT_BENCH_SCENARIO = path.join(PACKAGE_ROOT, 'scenarios', 'dry-baseline-walk.yaml');

/** The standard set `npm run bench` measures: four reference builds and the Python example. */
export function defaultBenchBuilds(): BuildSpec[] {
  const python = path.join(PACKAGE_ROOT, 'examples', 'python', 'stand_controller.py');
  return [
    ...DEFAULT_BUILDS.map((text) => parseBuildSpec(text, PACKAGE_ROOT)),
    parseBuildSpec(`stand-py=exec:python3 ${JSON.stringify(python)}`, PACKAGE_ROOT),
  ];
}
