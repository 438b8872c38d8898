// The project configuration file, footing.config.yaml, as data (validated against
// config.schema.json), and the settings a command resolves from it, the flags and the defaults.

import type { BuildOptionValue } from '../builds/spec.js';

export const CONFIG_FILE_NAMES = ['footing.config.yaml', 'footing.config.yml'] as const;

export interface GitRecipeData {
  repo?: string;
  build?: string;
  entry?: string;
  kind?: 'module' | 'process';
  args?: string[];
  options?: Record<string, BuildOptionValue>;
}

export interface GitBuildData extends GitRecipeData {
  ref: string;
}

export type SuiteData = string[] | { scenarios: string[]; builds?: string[]; baseline?: string; tags?: string[]; excludeTags?: string[] };

export interface ConfigData {
  version?: 1;
  suites?: Record<string, SuiteData>;
  builds?: Record<string, string | GitBuildData>;
  git?: GitRecipeData;
  baseline?: string;
  gate?: string | Record<string, unknown>;
  jobs?: number;
  out?: string;
  trace?: boolean;
  loopBudget_us?: number;
  bench?: boolean;
  cache?: string;
  /** History store file (harness/history), relative to this file. */
  history?: string;
}

/** Where a resolved value came from. */
export type Origin =
  | { from: 'flag'; flag: string }
  | { from: 'file'; file: string; path: string; line?: number; col?: number }
  | { from: 'default' };

export interface Sourced<T> {
  value: T;
  origin: Origin;
}
