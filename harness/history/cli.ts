// The yargs table of `footing history …` and `footing bisect` (kept here so harness/cli/main.ts
// only registers it): each handler calls a command function and hands back its exit code.

import type { Argv } from 'yargs';
import { runBisectCommand } from './bisect/command.js';
import { historyAdd, historyExport, historyList, historyReport } from './commands.js';

type Printer = (line: string) => void;

export interface CliIo {
  print: Printer;
  printError: Printer;
  setExit: (code: number) => void;
}

const projectOptions = (y: Argv) =>
  y
    .option('store', { type: 'string', describe: 'history store file (default: the config\'s history, else .footing/history.sqlite beside it)' })
    .option('config', { type: 'string', describe: 'project config file (default: ./footing.config.yaml when present)' });

function emit(io: CliIo, outcome: { exitCode: number; lines: string[] }): void {
  for (const line of outcome.lines) (outcome.exitCode === 0 ? io.print : io.printError)(line);
  io.setExit(outcome.exitCode);
}

export function registerHistoryCommands(parser: Argv, io: CliIo): Argv {
  return parser
    .command('history', 'the nights remembered: add results, list, export, trend report with change points', (y: Argv) =>
      y
        .command('add <results..>', 'add results sets (results.json or folders) to the history store; the same results twice change nothing', (a: Argv) =>
          projectOptions(a)
            .positional('results', { type: 'string', array: true, demandOption: true })
            .option('commit', { type: 'string', describe: 'file the night under this commit (default: the first build\'s)' }),
          (args) => emit(io, historyAdd({ results: args.results as string[], store: args.store as string | undefined, config: args.config as string | undefined, commit: args.commit as string | undefined, log: io.printError })))
        .command('list', 'list the nights in the store', (a: Argv) =>
          projectOptions(a)
            .option('json', { type: 'boolean', default: false, describe: 'as JSON' })
            .option('last-good', { type: 'boolean', default: false, describe: 'print only the commit of the newest night whose runs all passed (exit 1: none)' }),
          (args) => emit(io, historyList({ store: args.store as string | undefined, config: args.config as string | undefined, json: args.json as boolean, lastGood: args['last-good'] as boolean })))
        .command('export', 'export every stored metric value', (a: Argv) =>
          projectOptions(a)
            .option('csv', { type: 'boolean', default: false, describe: 'as CSV (one row per night × run × metric)' })
            .option('out', { alias: 'o', type: 'string', describe: 'file to write (default: standard output)' }),
          (args) => emit(io, historyExport({ store: args.store as string | undefined, config: args.config as string | undefined, csv: args.csv as boolean, out: args.out as string | undefined })))
        .command('report', 'trend page: per scenario × metric lines over nights, gate lines, change points (Pettitt\'s test)', (a: Argv) =>
          projectOptions(a)
            .option('out', { alias: 'o', type: 'string', demandOption: true, describe: 'HTML file to write' })
            .option('scenario', { type: 'string', array: true, describe: 'only these scenario ids (repeatable)' })
            .option('build', { alias: 'b', type: 'string', array: true, describe: 'only these builds (repeatable)' })
            .option('metric', { type: 'string', array: true, describe: 'only these trend metrics (repeatable)' })
            .option('last', { type: 'number', describe: 'only the last N nights of each line' })
            .option('alpha', { type: 'number', describe: 'significance level of the change-point test (default 0.01)' })
            .option('policy', { type: 'string', describe: 'gate policy YAML for the gate lines (default: the config\'s gate)' }),
          (args) => emit(io, historyReport({
            store: args.store as string | undefined,
            config: args.config as string | undefined,
            policy: args.policy as string | undefined,
            out: args.out as string,
            scenarios: args.scenario as string[] | undefined,
            builds: args.build as string[] | undefined,
            metrics: args.metric as string[] | undefined,
            last: args.last as number | undefined,
            alpha: args.alpha as number | undefined,
          })))
        .demandCommand(1, 'name a history verb: add, list, export, report'),
    () => {})
    .command('bisect [paths..]', 'find the first commit between --good and --bad whose runs break the gate against the good commit\'s', (y: Argv) =>
      y
        .positional('paths', { type: 'string', array: true, describe: 'scenario files or folders (default: the suite\'s, else scenarios)' })
        .option('good', { type: 'string', demandOption: true, describe: 'a commit (ref) known good' })
        .option('bad', { type: 'string', demandOption: true, describe: 'a later commit (ref) known bad' })
        .option('suite', { alias: 's', type: 'string', describe: 'the scenarios of a named suite of the config' })
        .option('rule', { type: 'string', describe: 'judge by one gate rule (e.g. frictionMarginMinLoss) or a threshold (frictionMargin.min>=0.3); default: the whole gate policy' })
        .option('policy', { type: 'string', describe: 'gate policy YAML (default: the config\'s gate)' })
        .option('config', { type: 'string', describe: 'project config file (default: ./footing.config.yaml when present)' })
        .option('out', { alias: 'o', type: 'string', describe: 'folder for bisect.json and bisect.md (default: bisect/ beside the config\'s out)' })
        .option('jobs', { alias: 'j', type: 'number', describe: 'parallel runs per commit' })
        .option('verify-bad', { type: 'boolean', default: false, describe: 'run the --bad commit first to confirm it is bad (one more build)' }),
      async (args) => {
        const paths = args.paths as string[] | undefined;
        // Every line, the answer last, went to standard error as it happened (a bisect takes minutes).
        const outcome = await runBisectCommand({
          good: args.good as string,
          bad: args.bad as string,
          paths: paths && paths.length > 0 ? paths : undefined,
          suite: args.suite as string | undefined,
          rule: args.rule as string | undefined,
          policy: args.policy as string | undefined,
          config: args.config as string | undefined,
          out: args.out as string | undefined,
          jobs: args.jobs as number | undefined,
          verifyBad: args['verify-bad'] as boolean,
          log: io.printError,
        });
        io.setExit(outcome.exitCode);
      });
}
