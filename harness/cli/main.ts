// The thin command-line layer: yargs parses, each command calls a function the tests can call
// directly, and the function's exit code becomes the process's.

import yargs, { type Argv } from 'yargs';
import { checkPaths } from '../scenario/index.js';
import { runGate } from '../gate/runGate.js';
import { DEFAULT_SCENARIO_PATHS, EXIT } from '../run/suite.js';
import { mergeResults } from '../run/merge.js';
import { runReportCommand } from '../report/command.js';
import { runMarginCommand } from '../margin/command.js';
import { runBenchCommand } from '../bench/command.js';
import { benchSuite, renderSuiteBench } from '../bench/suite.js';
import { clearCache, printConfig, runConfiguredSuite } from '../config/commands.js';
import { DEFAULT_BUILDS, DEFAULT_OUT_DIR } from '../config/defaults.js';
import type { RunFlags } from '../config/resolve.js';
import { TOOL_VERSION } from '../version.js';
import { registerHistoryCommands } from '../history/cli.js';
import { addRunToHistory } from '../history/commands.js';
import { benchHistory, renderHistoryBench } from '../history/bench.js';

/** What `footing run` replays when neither --build nor footing.config.yaml names builds. */
export { DEFAULT_BUILDS, DEFAULT_OUT_DIR };

/** The options `run` and `config --print` share: what decides the resolved settings. */
function settingOptions(y: Argv): Argv {
  return y
    .option('config', { type: 'string', describe: 'project config file (default: ./footing.config.yaml when present)' })
    .option('suite', { alias: 's', type: 'string', describe: 'run a named suite of the config file' })
    .option('build', { alias: 'b', type: 'string', array: true, describe: `build spec: NAME=module.js, NAME=exec:program args…, ref:ID, NAME=git:REF, or a config build's name (repeatable; default: the config's builds, else ${DEFAULT_BUILDS.join(' ')})` })
    .option('out', { alias: 'o', type: 'string', describe: `results folder (default: the config's out, else ${DEFAULT_OUT_DIR})` })
    .option('jobs', { alias: 'j', type: 'number', describe: 'parallel runs (default: the config\'s jobs, else the core count)' })
    .option('baseline', { type: 'string', describe: 'gate every other build against this one (writes gate.md)' })
    .option('policy', { type: 'string', describe: 'gate policy YAML (default: the config\'s gate, else docs/scoring.md)' })
    .option('trace', { type: 'boolean', describe: 'write traces/<scenario>__<build>.csv' })
    .option('loop-budget', { type: 'number', describe: 'loop budget (µs) of this machine, replacing each scenario\'s' })
    .option('bench', { type: 'boolean', describe: 'also bench every build (governor rate, tick time, real-time factor) into results.json' });
}

function runFlags(args: Record<string, unknown>): RunFlags {
  const paths = args.paths as string[] | undefined;
  return {
    config: args.config as string | undefined,
    suite: args.suite as string | undefined,
    paths: paths && paths.length > 0 ? paths : undefined,
    builds: args.build as string[] | undefined,
    out: args.out as string | undefined,
    jobs: args.jobs as number | undefined,
    baseline: args.baseline as string | undefined,
    policy: args.policy as string | undefined,
    trace: args.trace as boolean | undefined,
    loopBudget_us: args['loop-budget'] as number | undefined,
    bench: args.bench as boolean | undefined,
    shard: args.shard as string | undefined,
    resume: args.resume as boolean | undefined,
    quiet: args.quiet as boolean | undefined,
  };
}

const print = (line: string) => process.stdout.write(`${line}\n`);
const printError = (line: string) => process.stderr.write(`${line}\n`);

export async function main(argv: string[]): Promise<number> {
  let exitCode: number = EXIT.pass;
  let parser = yargs(argv)
    .scriptName('footing')
    .usage('$0 <command> [options]\n\nRegression harness for legged-robot controllers: replays contact scenarios through controller builds, scores friction-cone use, slip, falls and loop time, and gates merges.')
    .command(
      'run [paths..]',
      'replay scenarios through builds, score every run, write the results folder',
      (y: Argv) =>
        settingOptions(y)
          .positional('paths', { type: 'string', array: true, describe: `scenario files or folders (default: the suite's, else ${DEFAULT_SCENARIO_PATHS.join(' ')})` })
          .option('shard', { type: 'string', describe: 'run shard K/N of the pairs (deterministic)' })
          .option('resume', { type: 'boolean', describe: 'skip pairs already complete in --out', default: false })
          .option('quiet', { alias: 'q', type: 'boolean', describe: 'print only the outcome', default: false })
          .option('exit-zero', { type: 'boolean', describe: 'exit 0 even when runs fail (still 2 on bad input)', default: false })
          .option('history', { type: 'boolean', describe: 'also add the results to the history store as a night (docs/history.md)' })
          .option('store', { type: 'string', describe: 'history store file for --history (default: the config\'s history, else .footing/history.sqlite)' }),
      async (args) => {
        const outcome = await runConfiguredSuite(runFlags(args), { log: printError });
        exitCode = outcome.exitCode === EXIT.fail && args['exit-zero'] ? EXIT.pass : outcome.exitCode;
        if (args.history && outcome.results) {
          const added = addRunToHistory(outcome.results, { store: args.store as string | undefined, config: args.config as string | undefined });
          for (const line of added.lines) printError(line);
          if (added.exitCode !== 0) exitCode = Math.max(exitCode, added.exitCode);
        }
      },
    )
    .command(
      'config',
      'show the resolved configuration and where each value came from (file, flag, default)',
      (y: Argv) =>
        settingOptions(y)
          .option('print', { type: 'boolean', describe: 'print the resolved configuration', default: true })
          .option('json', { type: 'boolean', describe: 'as JSON', default: false }),
      async (args) => {
        const outcome = await printConfig(runFlags(args), { json: args.json as boolean });
        for (const line of outcome.lines) (outcome.exitCode === EXIT.pass ? print : printError)(line);
        exitCode = outcome.exitCode;
      },
    )
    .command(
      'cache',
      'manage the cache of git-ref builds (.footing-cache/ by default)',
      (y: Argv) =>
        y
          .option('clear', { type: 'boolean', demandOption: true, describe: 'remove every cached build and its worktree' })
          .option('config', { type: 'string', describe: 'project config file (default: ./footing.config.yaml when present)' }),
      async (args) => {
        const outcome = await clearCache({ config: args.config as string | undefined });
        for (const line of outcome.lines) (outcome.exitCode === EXIT.pass ? print : printError)(line);
        exitCode = outcome.exitCode;
      },
    )
    .command(
      'check [paths..]',
      'validate scenario files (exit 0 all valid, 2 otherwise)',
      (y: Argv) => y.positional('paths', { type: 'string', array: true, default: DEFAULT_SCENARIO_PATHS }),
      async (args) => {
        const outcome = await checkPaths(args.paths as string[]);
        for (const line of outcome.lines) print(line);
        exitCode = outcome.exitCode;
      },
    )
    .command(
      'gate',
      'compare two result sets; exit 1 when the candidate breaks a policy rule',
      (y: Argv) =>
        y
          .option('baseline', { type: 'string', demandOption: true, describe: 'results.json or results folder of the reference' })
          .option('candidate', { type: 'string', demandOption: true, describe: 'results.json or results folder to judge' })
          .option('policy', { type: 'string', describe: 'gate policy YAML' })
          .option('pair', { type: 'string', array: true, describe: 'pair builds explicitly: BASE=CAND (repeatable)' })
          .option('out', { type: 'string', describe: 'folder for gate.md (default: the candidate folder)' }),
      async (args) => {
        const outcome = await runGate({
          baseline: args.baseline as string,
          candidate: args.candidate as string,
          policyFile: args.policy as string | undefined,
          pairs: args.pair as string[] | undefined,
          out: args.out as string | undefined,
        });
        print(outcome.text);
        exitCode = outcome.exitCode;
      },
    )
    .command(
      'merge <dirs..>',
      'combine shard result folders into one results set',
      (y: Argv) =>
        y
          .positional('dirs', { type: 'string', array: true, demandOption: true })
          .option('out', { alias: 'o', type: 'string', demandOption: true, describe: 'merged results folder' }),
      async (args) => {
        const outcome = mergeResults(args.dirs as string[], args.out as string);
        for (const line of outcome.lines) (outcome.exitCode === 0 ? print : printError)(line);
        exitCode = outcome.exitCode;
      },
    )
    .command(
      'bench',
      'measure governor update rate, controller tick time and closed-loop real-time factor per build',
      (y: Argv) =>
        y
          .option('build', { alias: 'b', type: 'string', array: true, default: [], describe: 'build spec (repeatable; default: the reference builds and the Python example)' })
          .option('scenario', { type: 'string', describe: 'scenario the observations are recorded from (default: scenarios/dry-baseline-walk.yaml)' })
          .option('json', { type: 'string', describe: 'write the figures as JSON (schema: harness/bench/bench.schema.json)' })
          .option('time-ms', { type: 'number', describe: 'time per measured task, milliseconds' })
          .option('suite-runs', { type: 'number', describe: 'instead: wall time and peak memory of N runs of 10 s through the suite runner' })
          .option('history', { type: 'boolean', describe: 'instead: load 365 nights × 200 scenarios × 3 builds (generated) into a history store, time a trend query' }),
      async (args) => {
        if (args.history) {
          for (const line of renderHistoryBench(await benchHistory({ log: printError, time_ms: args['time-ms'] as number | undefined }))) print(line);
          return;
        }
        if (args['suite-runs'] !== undefined) {
          const runs = args['suite-runs'] as number;
          if (!(Number.isInteger(runs) && runs > 0)) {
            printError(`footing bench: --suite-runs ${runs}: expected a positive whole number`);
            exitCode = EXIT.badInput;
            return;
          }
          for (const line of renderSuiteBench(await benchSuite({ runs }))) print(line);
          return;
        }
        const outcome = await runBenchCommand({
          builds: args.build as string[],
          scenario: args.scenario as string | undefined,
          json: args.json as string | undefined,
          time_ms: args['time-ms'] as number | undefined,
        });
        for (const line of outcome.lines) (outcome.exitCode === 2 ? printError : print)(line);
        exitCode = outcome.exitCode;
      },
    )
    .command(
      'report <results..>',
      're-render the HTML report from saved results (and their series/traces) without re-running',
      (y: Argv) =>
        y
          .positional('results', { type: 'string', array: true, demandOption: true, describe: 'results.json files or results folders' })
          .option('out', { alias: 'o', type: 'string', demandOption: true, describe: 'HTML file to write' })
          .option('baseline', { type: 'string', describe: 'build to compare the others with' })
          .option('bench', { type: 'string', describe: 'bench JSON (footing bench --json) to show' }),
      async (args) => {
        const outcome = await runReportCommand({
          results: args.results as string[],
          out: args.out as string,
          baseline: args.baseline as string | undefined,
          bench: args.bench as string | undefined,
        });
        for (const line of outcome.lines) (outcome.exitCode === 2 ? printError : print)(line);
        exitCode = outcome.exitCode;
      },
    )
    .command(
      'margin [paths..]',
      'find, per scenario and build, the lowest friction scale and the largest push scale it survives',
      (y: Argv) =>
        y
          .positional('paths', { type: 'string', array: true, default: DEFAULT_SCENARIO_PATHS, describe: 'scenario files or folders' })
          .option('build', { alias: 'b', type: 'string', array: true, default: DEFAULT_BUILDS, describe: 'build spec (repeatable)' })
          .option('out', { alias: 'o', type: 'string', default: 'reports/out/margin', describe: 'results folder' })
          .option('tolerance', { type: 'number', default: 0.01, describe: 'bisection tolerance on the scale' })
          .option('jobs', { alias: 'j', type: 'number', describe: 'parallel searches (default: core count)' }),
      async (args) => {
        const outcome = await runMarginCommand({
          paths: args.paths as string[],
          build: args.build as string[],
          out: args.out as string,
          tolerance: args.tolerance as number,
          jobs: args.jobs as number | undefined,
          log: printError,
        });
        exitCode = outcome.exitCode;
      },
    );
  parser = registerHistoryCommands(parser, { print, printError, setExit: (code) => (exitCode = code) })
    .demandCommand(1, 'name a command: run, check, gate, merge, report, margin, bench, config, cache, history, bisect (footing --help lists them)')
    .strict()
    .version(TOOL_VERSION)
    .help()
    .epilogue('Simulation is not proof of safety: hardware trials follow your lab\'s risk assessment, local codes and licensed practice.')
    .fail((message, error) => {
      if (error) throw error;
      printError(message);
      printError('(footing --help lists the commands and options)');
      exitCode = EXIT.badInput;
    })
    .exitProcess(false);
  try {
    await parser.parseAsync();
  } catch (error) {
    printError(`footing: internal error: ${(error as Error).stack ?? error}`);
    return EXIT.internal;
  }
  return exitCode;
}
