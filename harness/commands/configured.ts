// The scenarios, builds and selection of `margin` and `bench` when they are given --config or
// --suite: read from footing.config.yaml the way `run` reads them (config/resolve.ts), flags
// first. Without either, the command's own flags stand as given. Git-ref builds are checked out
// and built as `run` builds them (gitBuilds.ts, the same cache); one that fails to build stops the
// command (exit 1): there is nothing to measure.

import type { BuildSpec } from '../builds/spec.js';
import type { ScenarioSelection } from '../scenario/select.js';
import { resolveForCommand } from './config.js';
import { EXIT } from './exit.js';
import { prepareConfiguredBuilds } from './gitBuilds.js';
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
  /** What the git preparation said (each build's commit, cached or built). */
  lines: string[];
}

export async function configuredSuite(command: string, args: ConfiguredArgs, log: (line: string) => void = () => undefined): Promise<ConfiguredSuite | CommandOutcome> {
  const cwd = args.cwd ?? process.cwd();
  if (args.config === undefined && args.suite === undefined) return { paths: args.paths, builds: args.build, selection: args.selection, cwd, lines: [] };
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
  const lines: string[] = [];
  const git = await prepareConfiguredBuilds(settings.builds, (line) => {
    lines.push(line);
    log(line);
  });
  if (!git.ok) return { exitCode: EXIT.badInput, lines: [...git.lines, `footing ${command}: nothing was run; fix the refs above`] };
  const failed = git.prepared.filter((build) => build.failure !== undefined);
  if (failed.length > 0) {
    return { exitCode: EXIT.fail, lines: [...lines, `footing ${command}: nothing was measured; build ${failed.map((b) => b.spec.name).join(', ')} could not be built (see above)`] };
  }
  const builds: BuildSpec[] = git.prepared.map((build) => build.spec);
  return { paths: settings.paths.value, builds, selection: settings.selection, cwd: settings.cwd, lines };
}
