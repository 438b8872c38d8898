// `footing margin`: for every (scenario × build) pair, the critical friction scale and the critical
// push scale (the search engine: harness/margin/runMargins.ts), then the results folder with
// margin.md. runMargins takes the options as a test gives them; runMarginCommand as the CLI does.
//
//   footing margin [paths..] --build SPEC [--build SPEC ...] --out DIR [--tolerance 0.01] [--jobs N]
//
// Exit codes as footing run: 0 every pair passes as written (margins measured), 1 a pair fails or
// errors as written (its margins are still measured where possible), 2 bad input, 3 internal.

import { mkdirSync } from 'node:fs';
import path from 'node:path';
import { writeFileAtomicSync } from '../files/atomic.js';
import { renderMarginMarkdown } from '../margin/render.js';
import { checkMarginSettings, MARGIN_DEFAULTS, searchMargins, type MarginQuantity, type MarginSettings } from '../margin/runMargins.js';
import { createResultsFile } from '../results/runResult.js';
import type { ResultsFile } from '../results/types.js';
import { buildManifests } from '../run/prepare.js';
import { TOOL_VERSION } from '../version.js';
import { EXIT, exitCodeOfRuns } from './exit.js';
import { OUTPUT_FILES, writeOutputs } from './outputs.js';
import type { BuildSpec } from '../builds/spec.js';
import type { ScenarioSelection } from '../scenario/select.js';
import { configuredSuite } from './configured.js';
import { isOutcome, prepareBuildSpecs, prepareScenarioList, startCommand, type CommandOutcome, type SuiteCommandOptions } from './skeleton.js';

export { MARGIN_COMMAND_DEFAULTS } from './marginDefaults.js';

export interface MarginRunOptions extends SuiteCommandOptions {
  builds: (string | BuildSpec)[];
  tolerance?: number;
  frictionRange?: readonly [number, number];
  pushRange?: readonly [number, number];
  checks?: number;
  /** Which searches to run (default both). */
  quantities?: readonly MarginQuantity[];
}

export interface MarginRunOutcome extends CommandOutcome {
  results?: ResultsFile;
}

export async function runMargins(options: MarginRunOptions): Promise<MarginRunOutcome> {
  const out = startCommand(options.log);
  const cwd = options.cwd ?? process.cwd();
  const settings: MarginSettings = {
    tolerance: options.tolerance ?? MARGIN_DEFAULTS.tolerance,
    frictionRange: options.frictionRange ?? MARGIN_DEFAULTS.frictionRange,
    pushRange: options.pushRange ?? MARGIN_DEFAULTS.pushRange,
    checks: options.checks ?? MARGIN_DEFAULTS.checks,
    quantities: options.quantities ?? (['friction', 'push'] as const),
  };
  const problem = checkMarginSettings(settings);
  if (problem) return out.badInput(`footing margin: ${problem}`);

  const specs = prepareBuildSpecs(out, 'margin', options.builds, cwd);
  if (isOutcome(specs)) return specs;
  // The order footing run uses: scenarios by file then id (run/prepare.ts), builds as given.
  const scenarios = await prepareScenarioList(out, 'margin', options.paths, cwd, options.selection);
  if (isOutcome(scenarios)) return scenarios;

  const outDir = path.resolve(cwd, options.outDir);
  mkdirSync(outDir, { recursive: true });
  const manifests = await buildManifests(specs);
  const startedAt = new Date();
  const { runs, wall_s, jobs } = await searchMargins({ scenarios, builds: specs, outDir, settings, jobs: options.jobs, runTimeout: options.runTimeout, log: out.log });

  const results = createResultsFile({ toolVersion: TOOL_VERSION, builds: manifests, startedAt, runs });
  writeOutputs(outDir, results);
  writeFileAtomicSync(path.join(outDir, OUTPUT_FILES.margin), renderMarginMarkdown(results, { wall_s, jobs }));
  const probes = runs.reduce((n, r) => n + (r.margin?.friction?.runs ?? 0) + (r.margin?.push?.runs ?? 0) - (r.margin?.friction && r.margin?.push ? 1 : 0), 0);
  out.log(`${runs.length} pairs, ${probes} runs in ${wall_s.toFixed(1)} s on ${jobs} worker${jobs === 1 ? '' : 's'} — ${path.relative(cwd, path.join(outDir, OUTPUT_FILES.margin)) || OUTPUT_FILES.margin}, ${OUTPUT_FILES.results}`);
  return { ...out.finish(exitCodeOfRuns(runs)), results };
}

export interface MarginCommandArgs {
  paths?: string[];
  build: string[];
  out: string;
  /** --config/--suite: scenarios, builds and selection from footing.config.yaml as `run` reads them. */
  config?: string;
  suite?: string;
  selection?: ScenarioSelection;
  tolerance?: number;
  jobs?: number;
  /** Only one of the searches (default both). */
  only?: MarginQuantity;
  cwd?: string;
  /** Called with each line as it happens (the CLI prints to stderr). */
  log?: (line: string) => void;
}

export async function runMarginCommand(args: MarginCommandArgs): Promise<CommandOutcome> {
  try {
    const configured = await configuredSuite('margin', args, args.log);
    if ('exitCode' in configured) return configured;
    const outcome = await runMargins({
      paths: configured.paths,
      builds: configured.builds,
      selection: configured.selection,
      outDir: args.out,
      tolerance: args.tolerance,
      jobs: args.jobs,
      quantities: args.only ? [args.only] : undefined,
      cwd: configured.cwd,
      log: args.log,
    });
    return { exitCode: outcome.exitCode, lines: [...configured.lines, ...outcome.lines] };
  } catch (error) {
    return { exitCode: EXIT.internal, lines: [`footing margin: internal error: ${(error as Error).stack ?? String(error)}`] };
  }
}
