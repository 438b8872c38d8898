// What `footing run` uses when neither a flag nor footing.config.yaml says otherwise, gathered here
// for the config layer and the CLI's help text from where each fact lives.

import { DEFAULT_CACHE_DIR } from '../builds/git.js';
import { DEFAULT_BUILDS } from '../builds/spec.js';
import { DEFAULT_SCENARIO_PATHS } from '../scenario/paths.js';

export const DEFAULT_OUT_DIR = 'reports/out/latest';
export { DEFAULT_BUILDS, DEFAULT_CACHE_DIR, DEFAULT_SCENARIO_PATHS };
