// The scenarios, builds and selection of `margin` and `bench` when they are given --config or
// --suite: read from footing.config.yaml the way `run` reads them (config/resolve.ts), flags
// first. Without either, the command's own flags stand as given.

import type { BuildSpec } from '../builds/spec.js';
import { itemLabel } from '../config/resolve.js';
import type { ScenarioSelection } from '../scenario/select.js';
import { resolveForCommand } from './config.js';
import { EXIT } from './exit.js';
import type { CommandOutcome } from './skeleton.js';

export interface ConfiguredArgs {
  paths?: string[];
  build: string[];
  config?: string;
  suite?: string;
  selection?: ScenarioSelection;
  cwd?: string;
}

export interface ConfiguredSuite {
  paths?: string[];
  /** Spec texts (relative to cwd) or specs the config resolved (relative to its folder). */
  builds: (string | BuildSpec)[];
  selection?: ScenarioSelection;
  cwd: string;
}

export function configuredSuite(command: string, args: ConfiguredArgs): ConfiguredSuite | CommandOutcome {
  const cwd = args.cwd ?? process.cwd();
  if (args.config === undefined && args.suite === undefined) return { paths: args.paths, builds: args.build, selection: args.selection, cwd };
  const resolved = resolveForCommand({
    config: args.config,
    suite: args.suite,
    paths: args.paths,
    builds: args.build.length > 0 ? args.build : undefined,
    tags: args.selection?.tags ? [...args.selection.tags] : undefined,
    excludeTags: args.selection?.excludeTags ? [...args.selection.excludeTags] : undefined,
    grep: args.selection?.grep,
    cwd,
  });
  if (!resolved.ok) return { exitCode: EXIT.badInput, lines: [...resolved.lines, `footing ${command}: nothing was run; fix the configuration above`] };
  const settings = resolved.settings;
  const builds: BuildSpec[] = [];
  for (const build of settings.builds) {
    // Git-ref builds are checked out and built by `footing run` (its cache); here they are bad input.
    if (build.kind === 'git') {
      return {
        exitCode: EXIT.badInput,
        lines: [`${itemLabel(build.origin)}: footing ${command} takes module, program and reference builds; build ${build.name} (git:${build.recipe.ref}) is built by footing run only — name others with --build`],
      };
    }
    builds.push(build.spec);
  }
  return { paths: settings.paths.value, builds, selection: settings.selection, cwd: settings.cwd };
}
