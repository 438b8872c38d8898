// What `footing run` uses when neither a flag nor footing.config.yaml says otherwise — the one
// place these defaults live (the CLI's help text should import them from here).

import { DEFAULT_CACHE_DIR } from '../builds/git.js';
import { DEFAULT_SCENARIO_PATHS } from '../run/suite.js';

/** The four reference controllers (docs/reference-controllers.md). */
export const DEFAULT_BUILDS: readonly string[] = ['ref:nominal', 'ref:governed', 'ref:clamped', 'ref:qp'];
export const DEFAULT_OUT_DIR = 'reports/out/latest';
export { DEFAULT_CACHE_DIR, DEFAULT_SCENARIO_PATHS };
