// Public API of the scenario layer: load, validate, migrate, expand and hash scenario files.

export type { FileIssue } from '../files/issue.js';
export { formatIssue } from '../files/issue.js';
export type { LoadOptions, LoadCache, LoadResult, RobotLoadResult } from './load.js';
export { loadScenarioFile, loadScenarioText, loadRobotFile, loadRobotText, createLoadCache, defaultSuiteRoot } from './load.js';
export type { SuiteFileReport, SuiteResult, SuiteOptions } from './suite.js';
export { loadSuite } from './suite.js';
export { canonicalJson, scenarioHash } from './canonical.js';
export { compareIdentity, type ScenarioIdentity, type IdentityComparison } from './identity.js';
export { CURRENT_SCENARIO_VERSION, CURRENT_ROBOT_VERSION, SCENARIO_MIGRATIONS, migrateScenario } from './migrate.js';
export { expandMatrix, idFragment } from './matrix.js';
export { DEFAULT_MATERIAL } from './defaults.js';
export { SCENARIO_FORMAT, ROBOT_FORMAT } from './format.js';
export type * from './types.js';
