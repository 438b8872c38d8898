// The thin command-line layer: a yargs table over harness/commands. Each row parses its options,
// calls one command function (the same function the tests call) and prints the lines it returns;
// the command's exit code becomes the process's. Each command module is imported when its command
// runs, so `--help` and a quick `check` load only what they use.

import yargs, { type Argv } from 'yargs';
import { EXIT, type ExitCode } from '../commands/exit.js';
import { MARGIN_COMMAND_DEFAULTS } from '../commands/marginDefaults.js';
import type { CommandOutcome } from '../commands/skeleton.js';
import { DEFAULT_BUILDS, DEFAULT_OUT_DIR, DEFAULT_SCENARIO_PATHS } from '../config/defaults.js';
import type { RunFlags } from '../config/resolve.js';
import { registerHistoryCommands } from '../history/cli.js';
import type { ScenarioSelection } from '../commands/skeleton.js';
import { TOOL_VERSION } from '../version.js';
import { statSync } from 'node:fs';

/** What `footing run` replays when neither --build nor footing.config.yaml names builds. */
export { DEFAULT_BUILDS, DEFAULT_OUT_DIR };

type Args = Record<string, unknown>;

/** Where a command's returned lines go: run and margin log theirs to stderr as they happen. */
type Printing = 'logged' | 'stdout' | 'stderrUnlessPass' | 'stderrOnBadInput';

interface CommandRow {
  usage: string;
  describe: string;
  options: (y: Argv) => Argv;
  printing: Printing;
  call: (args: Args, log: (line: string) => void) => Promise<CommandOutcome>;
}

/** The options `run` and `config --print` share: what decides the resolved settings. */
function settingOptions(y: Argv): Argv {
  return y
    .option('config', { type: 'string', describe: 'project config file (default: ./footing.config.yaml when present)' })
    .option('suite', { alias: 's', type: 'string', describe: 'run a named suite of the config file' })
    .option('build', { alias: 'b', type: 'string', array: true, nargs: 1, describe: `build spec: NAME=module.js, NAME=exec:program args…, ref:ID, NAME=git:REF, or a config build's name (repeatable; default: the config's builds, else ${DEFAULT_BUILDS.join(' ')})` })
    .option('out', { alias: 'o', type: 'string', describe: `results folder (default: the config's out, else ${DEFAULT_OUT_DIR})` })
    .option('jobs', { alias: 'j', type: 'number', describe: 'parallel runs (default: the config\'s jobs, else the core count)' })
    .option('baseline', { type: 'string', describe: 'gate every other build against this one (writes gate.md)' })
    .option('policy', { type: 'string', describe: 'gate policy YAML (default: the config\'s gate, else docs/scoring.md)' })
    .option('trace', { type: 'boolean', describe: 'write traces/<scenario>__<build>.csv' })
    .option('loop-budget', { type: 'number', describe: 'loop budget (µs) of this machine, replacing each scenario\'s' })
    .option('bench', { type: 'boolean', describe: 'also bench every build (governor rate, tick time, real-time factor) into results.json' })
    .check(numbersWithin({ jobs: 'count', 'loop-budget': 'positive' }));
}

type NumberRule = 'count' | 'positive';

/** A flag's value refused before anything runs (exit 2, like yargs' own usage errors). */
class UsageError extends Error {}

/**
 * Numeric flags checked before anything runs: yargs reads `--jobs abc` as NaN and `--jobs 0` as
 * 0, and a negative loop budget would run every pair and then fail to write a valid result.
 */
function numbersWithin(rules: Record<string, NumberRule>): (args: Args) => true {
  return (args) => {
    for (const [flag, rule] of Object.entries(rules)) {
      const value = args[flag];
      if (value === undefined) continue;
      const ok = typeof value === 'number' && Number.isFinite(value) && value > 0 && (rule !== 'count' || Number.isInteger(value));
      if (!ok) {
        const given = typeof value === 'number' && Number.isNaN(value) ? ': not a number' : ` ${Array.isArray(value) ? value.join(' ') : String(value)}`;
        throw new UsageError(`--${flag}${given}: expected ${rule === 'count' ? 'a whole number ≥ 1' : 'a number > 0'}`);
      }
    }
    return true;
  };
}

/** --tag, --exclude-tag, --grep: which scenarios run, margin and check take (scenario/select.ts). */
function selectionOptions(y: Argv): Argv {
  return y
    .option('tag', { type: 'string', array: true, describe: 'only scenarios carrying this tag (repeatable: every one must match)' })
    .option('exclude-tag', { type: 'string', array: true, describe: 'leave out scenarios carrying this tag (repeatable)' })
    .option('grep', { type: 'string', describe: 'only scenarios whose id matches this regular expression' });
}

function selection(args: Args): ScenarioSelection {
  return { tags: args.tag as string[] | undefined, excludeTags: args['exclude-tag'] as string[] | undefined, grep: args.grep as string | undefined };
}

function runFlags(args: Args): RunFlags {
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
    shardCount: args['shard-count'] as number | undefined,
    tags: args.tag as string[] | undefined,
    excludeTags: args['exclude-tag'] as string[] | undefined,
    grep: args.grep as string | undefined,
    resume: args.resume as boolean | undefined,
    quiet: args.quiet as boolean | undefined,
  };
}

const COMMANDS: CommandRow[] = [
  {
    usage: 'run [paths..]',
    describe: 'replay scenarios through builds, score every run, write the results folder',
    options: (y) =>
      selectionOptions(settingOptions(y))
        .positional('paths', { type: 'string', array: true, describe: `scenario files or folders (default: the suite's, else ${DEFAULT_SCENARIO_PATHS.join(' ')})` })
        .option('shard', { type: 'string', describe: 'run shard K/N of the pairs (deterministic); auto: K and N from CI_NODE_INDEX/CI_NODE_TOTAL, SLURM_ARRAY_TASK_ID/SLURM_ARRAY_TASK_COUNT or JOB_COMPLETION_INDEX (docs/scale-out.md)' })
        .option('shard-count', { type: 'number', describe: 'N for --shard auto when the scheduler gives only the index (Kubernetes Indexed Jobs; or FOOTING_SHARD_COUNT)' })
        .option('resume', { type: 'boolean', describe: 'skip pairs already complete in --out', default: false })
        .option('quiet', { alias: 'q', type: 'boolean', describe: 'print only the outcome', default: false })
        .option('exit-zero', { type: 'boolean', describe: 'exit 0 even when runs fail (still 2 on bad input)', default: false })
        .option('history', { type: 'boolean', describe: 'also add the results to the history store as a night (docs/history.md)' })
        .option('store', { type: 'string', describe: 'history store file for --history (default: the config\'s history, else .footing/history.sqlite)' }),
    printing: 'logged',
    call: async (args, log) => {
      const outcome = await (await import('../commands/run.js')).runConfiguredSuite(runFlags(args), { log, exitZero: args['exit-zero'] as boolean });
      if (!args.history || !outcome.results) return outcome;
      const { addRunToHistory } = await import('../history/commands.js');
      const added = addRunToHistory(outcome.results, { store: args.store as string | undefined, config: args.config as string | undefined });
      for (const line of added.lines) log(line);
      return added.exitCode === 0 ? outcome : { ...outcome, exitCode: Math.max(outcome.exitCode, added.exitCode) as ExitCode };
    },
  },
  {
    usage: 'config',
    describe: 'show the resolved configuration and where each value came from (file, flag, default)',
    options: (y) =>
      settingOptions(y)
        .option('print', { type: 'boolean', describe: 'print the resolved configuration', default: true })
        .option('json', { type: 'boolean', describe: 'as JSON', default: false }),
    printing: 'stderrUnlessPass',
    call: async (args) => (await import('../commands/config.js')).printConfig(runFlags(args), { json: args.json as boolean }),
  },
  {
    usage: 'cache',
    describe: 'manage the cache of git-ref builds (.footing-cache/ by default)',
    options: (y) =>
      y
        .option('clear', { type: 'boolean', describe: 'remove every cached build and its worktree' })
        .option('config', { type: 'string', describe: 'project config file (default: ./footing.config.yaml when present)' }),
    printing: 'stderrUnlessPass',
    call: async (args) =>
      args.clear === true
        ? (await import('../commands/cache.js')).clearCache({ config: args.config as string | undefined })
        : { exitCode: EXIT.badInput, lines: ['footing cache: name an action: footing cache --clear (removes every cached build and its worktree)'] },
  },
  {
    usage: 'check [paths..]',
    describe: 'validate scenario files (exit 0 all valid, 2 otherwise)',
    options: (y) => selectionOptions(y.positional('paths', { type: 'string', array: true, default: DEFAULT_SCENARIO_PATHS })),
    printing: 'stdout',
    call: async (args) => (await import('../commands/check.js')).checkPaths(args.paths as string[], {}, selection(args)),
  },
  {
    usage: 'gate',
    describe: 'compare two result sets; exit 1 when the candidate breaks a policy rule',
    options: (y) =>
      y
        .option('baseline', { type: 'string', demandOption: true, describe: 'results.json or results folder of the reference' })
        .option('candidate', { type: 'string', demandOption: true, describe: 'results.json or results folder to judge' })
        .option('policy', { type: 'string', describe: 'gate policy YAML' })
        .option('pair', { type: 'string', array: true, nargs: 1, describe: 'pair builds explicitly: BASE=CAND (repeatable)' })
        .option('out', { type: 'string', describe: 'folder for gate.md (default: the candidate folder)' }),
    printing: 'stdout',
    call: async (args) =>
      (await import('../commands/gate.js')).runGate({
        baseline: args.baseline as string,
        candidate: args.candidate as string,
        policyFile: args.policy as string | undefined,
        pairs: args.pair as string[] | undefined,
        out: args.out as string | undefined,
      }),
  },
  {
    usage: 'merge <dirs..>',
    describe: 'combine shard result folders into one results set',
    options: (y) =>
      y
        .positional('dirs', { type: 'string', array: true, demandOption: true })
        .option('out', { alias: 'o', type: 'string', demandOption: true, describe: 'merged results folder' }),
    printing: 'stderrUnlessPass',
    call: async (args) => (await import('../commands/merge.js')).mergeResults(args.dirs as string[], args.out as string),
  },
  {
    usage: 'bench',
    describe: 'measure governor update rate, controller tick time and closed-loop real-time factor per build',
    options: (y) =>
      y
        .option('build', { alias: 'b', type: 'string', array: true, nargs: 1, default: [], describe: 'build spec (repeatable; default: the --suite\'s or config\'s builds, else the reference builds and the Python example)' })
        .option('config', { type: 'string', describe: 'project config file whose builds to bench' })
        .option('suite', { alias: 's', type: 'string', describe: 'bench the builds of this suite of the config file' })
        .option('scenario', { type: 'string', describe: 'scenario the observations are recorded from (default: scenarios/dry-baseline-walk.yaml)' })
        .option('json', { type: 'string', describe: 'write the figures as JSON (schema: harness/bench/bench.schema.json)' })
        .option('time-ms', { type: 'number', describe: 'time per measured task, milliseconds' })
        .option('suite-runs', { type: 'number', describe: 'instead: wall time and peak memory of N runs of 10 s through the suite runner' })
        .option('targets', { type: 'boolean', describe: 'also measure the speed targets (start-up, one run, the suite, overhead, patches) and say which are met' })
        .option('history', { type: 'boolean', describe: 'instead: load 365 nights × 200 scenarios × 3 builds (generated) into a history store, time a trend query' })
        .check(numbersWithin({ 'time-ms': 'positive', 'suite-runs': 'count' })),
    printing: 'stderrOnBadInput',
    call: async (args, log) =>
      args.history
        ? await (async () => {
            const { benchHistory, renderHistoryBench } = await import('../history/bench.js');
            return { exitCode: EXIT.pass, lines: renderHistoryBench(await benchHistory({ log, time_ms: args['time-ms'] as number | undefined })) };
          })()
        : (await import('../commands/bench.js')).runBenchCommand({
        builds: args.build as string[],
        config: args.config as string | undefined,
        suite: args.suite as string | undefined,
        scenario: args.scenario as string | undefined,
        json: args.json as string | undefined,
        time_ms: args['time-ms'] as number | undefined,
        suiteRuns: args['suite-runs'] as number | undefined,
        targets: args.targets as boolean | undefined,
      }),
  },
  {
    usage: 'report <results..>',
    describe: 're-render the HTML report from saved results (and their series/traces) without re-running',
    options: (y) =>
      y
        .positional('results', { type: 'string', array: true, demandOption: true, describe: 'results.json files or results folders' })
        .option('out', { alias: 'o', type: 'string', demandOption: true, describe: 'HTML file to write' })
        .option('baseline', { type: 'string', describe: 'build to compare the others with' })
        .option('bench', { type: 'string', describe: 'bench JSON (footing bench --json) to show' }),
    printing: 'stderrOnBadInput',
    call: async (args) =>
      (await import('../commands/report.js')).runReportCommand({
        results: args.results as string[],
        out: args.out as string,
        baseline: args.baseline as string | undefined,
        bench: args.bench as string | undefined,
      }),
  },
  {
    usage: 'margin [paths..]',
    describe: 'find, per scenario and build, the lowest friction scale and the largest push scale it survives',
    options: (y) =>
      selectionOptions(y)
        .positional('paths', { type: 'string', array: true, describe: `scenario files or folders (default: the suite's, else ${DEFAULT_SCENARIO_PATHS.join(' ')})` })
        .option('build', { alias: 'b', type: 'string', array: true, nargs: 1, describe: `build spec (repeatable; default: the suite's or config's builds, else ${DEFAULT_BUILDS.join(' ')})` })
        .option('config', { type: 'string', describe: 'project config file (read only with --config or --suite)' })
        .option('suite', { alias: 's', type: 'string', describe: 'the scenarios, builds and tags of a named suite of the config file' })
        .option('out', { alias: 'o', type: 'string', default: MARGIN_COMMAND_DEFAULTS.out, describe: 'results folder' })
        .option('tolerance', { type: 'number', default: MARGIN_COMMAND_DEFAULTS.tolerance, describe: 'bisection tolerance on the scale' })
        .option('jobs', { alias: 'j', type: 'number', describe: 'parallel searches (default: core count)' })
        .check(numbersWithin({ jobs: 'count', tolerance: 'positive' })),
    printing: 'logged',
    call: async (args, log) =>
      (await import('../commands/margin.js')).runMarginCommand({
        paths: args.paths as string[] | undefined,
        build: (args.build as string[] | undefined) ?? (args.config === undefined && args.suite === undefined ? [...DEFAULT_BUILDS] : []),
        config: args.config as string | undefined,
        suite: args.suite as string | undefined,
        selection: selection(args),
        out: args.out as string,
        tolerance: args.tolerance as number,
        jobs: args.jobs as number | undefined,
        log,
      }),
  },
  {
    usage: 'import <log>',
    describe: 'turn a robot log (CSV or MCAP) into a scenario: commands, push, identified friction, recorded trajectory',
    options: (y) =>
      y
        .positional('log', { type: 'string', demandOption: true, describe: 'log file (.csv or .mcap)' })
        .option('map', { type: 'string', demandOption: true, describe: 'log map file (format footing-log-map, docs/recorded.md)' })
        .option('out', { alias: 'o', type: 'string', demandOption: true, describe: 'folder for the scenario and its files' })
        .option('id', { type: 'string', describe: "scenario id (default: the map's, else the log's name)" }),
    printing: 'stderrUnlessPass',
    call: async (args) => {
      let logBytes = 0;
      try {
        logBytes = statSync(args.log as string).size;
      } catch {
        // Reported by the import.
      }
      const { importCommand } = await import('../recorded/commands.js');
      const outcome = await importCommand({ log: args.log as string, map: args.map as string, out: args.out as string, id: args.id as string | undefined, progress: process.stderr.isTTY === true, logBytes });
      return { exitCode: outcome.exitCode as ExitCode, lines: outcome.lines };
    },
  },
  {
    usage: 'replay <scenario>',
    describe: 'run a build on an imported scenario and score how closely it reproduces the recording (fidelity.json)',
    options: (y) =>
      y
        .positional('scenario', { type: 'string', demandOption: true, describe: 'scenario written by footing import' })
        .option('build', { alias: 'b', type: 'string', demandOption: true, describe: 'build spec (as for run)' })
        .option('out', { alias: 'o', type: 'string', default: 'reports/out/replay', describe: 'folder for fidelity.json' }),
    printing: 'stderrOnBadInput',
    call: async (args) => {
      const { replayCommand } = await import('../recorded/commands.js');
      const outcome = await replayCommand({ scenario: args.scenario as string, build: args.build as string, out: args.out as string });
      return { exitCode: outcome.exitCode as ExitCode, lines: outcome.lines };
    },
  },
];

const print = (line: string) => process.stdout.write(`${line}\n`);
const printError = (line: string) => process.stderr.write(`${line}\n`);

function printOutcome(printing: Printing, outcome: CommandOutcome): void {
  if (printing === 'logged') return;
  const toStderr =
    (printing === 'stderrUnlessPass' && outcome.exitCode !== EXIT.pass) || (printing === 'stderrOnBadInput' && outcome.exitCode === EXIT.badInput);
  for (const line of outcome.lines) (toStderr ? printError : print)(line);
}

export async function main(argv: string[]): Promise<number> {
  let exitCode: ExitCode = EXIT.pass;
  // yargs with exitProcess(false) reports a usage error and may still call the handler: a usage
  // error means nothing runs.
  let usageError = false;
  let parser = yargs(argv)
    .scriptName('footing')
    .usage('$0 <command> [options]\n\nRegression harness for legged-robot controllers: replays contact scenarios through controller builds, scores friction-cone use, slip, falls and loop time, and gates merges.');
  const setExit = (code: number) => (exitCode = code as ExitCode);
  for (const row of COMMANDS) {
    parser = parser.command(row.usage, row.describe, row.options, async (args) => {
      if (usageError) return;
      const outcome = await row.call(args, printError);
      printOutcome(row.printing, outcome);
      exitCode = outcome.exitCode;
    });
  }
  parser = registerHistoryCommands(parser, { print, printError, setExit })
    .demandCommand(1, `name a command: ${[...COMMANDS.map((row) => row.usage.split(' ')[0]), 'history', 'bisect'].join(', ')} (footing --help lists them)`)
    .strict()
    .version(TOOL_VERSION)
    .help()
    .epilogue('Simulation is not proof of safety: hardware trials follow your lab\'s risk assessment, local codes and licensed practice.')
    .fail((message, error) => {
      usageError = true;
      // A check() that throws arrives as an error with our own message: a usage error, not a bug.
      if (error && !(error instanceof UsageError)) throw error;
      printError(message ?? (error as Error).message);
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
