// The shape every command shares: it collects the lines it says (and passes each to `log` as it
// happens), bad input is exit 2 with the lines saying what and nothing run, and suite-shaped
// commands (run, margin) prepare their builds and scenarios the same way.

import type { BuildSpec } from '../builds/spec.js';
import type { RunTimeout } from '../run/pool.js';
import { prepareBuilds, prepareScenarios } from '../run/prepare.js';
import { nothingSelected, selectScenarios, SelectionError, type ScenarioSelection } from '../scenario/select.js';
export type { ScenarioSelection } from '../scenario/select.js';
import type { ResolvedScenario } from '../scenario/types.js';
import { EXIT, type ExitCode } from './exit.js';

/** What every command returns: the exit code and the lines for the person at the terminal. */
export interface CommandOutcome {
  exitCode: ExitCode;
  lines: string[];
}

/** What every suite-shaped command (run, margin) is given besides its builds and own settings. */
export interface SuiteCommandOptions {
  /** Scenario files or folders (default scenario/paths.ts DEFAULT_SCENARIO_PATHS). */
  paths?: string[];
  /** Which of those scenarios: --tag, --exclude-tag, --grep (scenario/select.ts). */
  selection?: ScenarioSelection;
  /** Results folder, relative to cwd. */
  outDir: string;
  jobs?: number;
  runTimeout?: RunTimeout;
  /** Folder specs, paths and outDir are relative to (default process.cwd()). */
  cwd?: string;
  /** Called with each line as it happens; the lines are returned too. */
  log?: (line: string) => void;
}

export interface CommandLog {
  readonly lines: string[];
  log(line: string): void;
  /** Logs the lines; exit 2, nothing ran. */
  badInput(...lines: string[]): CommandOutcome;
  finish(exitCode: ExitCode): CommandOutcome;
}

export function startCommand(log?: (line: string) => void): CommandLog {
  const lines: string[] = [];
  const say = (line: string) => {
    lines.push(line);
    log?.(line);
  };
  return {
    lines,
    log: say,
    badInput(...problem) {
      for (const line of problem) say(line);
      return { exitCode: EXIT.badInput, lines };
    },
    finish(exitCode) {
      return { exitCode, lines };
    },
  };
}

/** True for an outcome (bad input) rather than prepared input. */
export function isOutcome(value: object): value is CommandOutcome {
  return 'exitCode' in value && 'lines' in value;
}

/** Build specs parsed once, names unique; a bad spec is one message (all its lines together). */
export function prepareBuildSpecs(out: CommandLog, command: string, builds: (string | BuildSpec)[], cwd: string, builtElsewhere?: ReadonlySet<string>): BuildSpec[] | CommandOutcome {
  const parsed = prepareBuilds(command, builds, cwd, builtElsewhere);
  return parsed.ok ? parsed.value : out.badInput(parsed.lines.join('\n'));
}

/** The scenarios in the canonical order; their warnings logged, their errors bad input. */
export async function prepareScenarioList(
  out: CommandLog,
  command: string,
  paths: string[] | undefined,
  cwd: string,
  selection?: ScenarioSelection,
): Promise<ResolvedScenario[] | CommandOutcome> {
  const loaded = await prepareScenarios(command, paths, cwd);
  if (!loaded.ok) return out.badInput(...loaded.lines);
  for (const line of loaded.warnings) out.log(line);
  let kept: ResolvedScenario[];
  try {
    kept = selectScenarios(loaded.value, selection);
  } catch (error) {
    if (error instanceof SelectionError) return out.badInput(`footing ${command}: ${error.message}`);
    throw error;
  }
  if (kept.length === 0 && selection) return out.badInput(`footing ${command}: ${nothingSelected(selection, loaded.value)}; nothing was run`);
  return kept;
}
