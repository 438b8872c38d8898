// The thin command-line layer: yargs parses, each command calls a function the tests can call
// directly, and the function's exit code becomes the process's.

import yargs, { type Argv } from 'yargs';
import { checkPaths } from '../scenario/index.js';
import { runGate } from '../gate/runGate.js';
import { DEFAULT_SCENARIO_PATHS, EXIT, runSuite } from '../run/suite.js';
import { mergeResults } from '../run/merge.js';
import { runReportCommand } from '../report/command.js';
import { TOOL_VERSION } from '../version.js';

/** What `footing run` replays when no --build is given: the four reference controllers. */
export const DEFAULT_BUILDS = ['ref:nominal', 'ref:governed', 'ref:clamped', 'ref:qp'];
export const DEFAULT_OUT_DIR = 'reports/out/latest';

const print = (line: string) => process.stdout.write(`${line}\n`);
const printError = (line: string) => process.stderr.write(`${line}\n`);

export async function main(argv: string[]): Promise<number> {
  let exitCode: number = EXIT.pass;
  const parser = yargs(argv)
    .scriptName('footing')
    .usage('$0 <command> [options]\n\nRegression harness for legged-robot controllers: replays contact scenarios through controller builds, scores friction-cone use, slip, falls and loop time, and gates merges.')
    .command(
      'run [paths..]',
      'replay scenarios through builds, score every run, write the results folder',
      (y: Argv) =>
        y
          .positional('paths', { type: 'string', array: true, describe: 'scenario files or folders', default: DEFAULT_SCENARIO_PATHS })
          .option('build', { alias: 'b', type: 'string', array: true, describe: 'build spec: NAME=module.js, NAME=exec:program args…, ref:ID (repeatable)', default: DEFAULT_BUILDS })
          .option('out', { alias: 'o', type: 'string', describe: 'results folder', default: DEFAULT_OUT_DIR })
          .option('trace', { type: 'boolean', describe: 'write traces/<scenario>__<build>.csv', default: false })
          .option('jobs', { alias: 'j', type: 'number', describe: 'parallel runs (default: core count)' })
          .option('shard', { type: 'string', describe: 'run shard K/N of the pairs (deterministic)' })
          .option('baseline', { type: 'string', describe: 'gate every other build against this one (writes gate.md)' })
          .option('policy', { type: 'string', describe: 'gate policy YAML (defaults: docs/scoring.md)' })
          .option('resume', { type: 'boolean', describe: 'skip pairs already complete in --out', default: false })
          .option('quiet', { alias: 'q', type: 'boolean', describe: 'print only the outcome', default: false })
          .option('exit-zero', { type: 'boolean', describe: 'exit 0 even when runs fail (still 2 on bad input)', default: false }),
      async (args) => {
        const outcome = await runSuite({
          paths: args.paths as string[],
          builds: args.build as string[],
          outDir: args.out as string,
          trace: args.trace as boolean,
          jobs: args.jobs as number | undefined,
          shard: args.shard as string | undefined,
          baseline: args.baseline as string | undefined,
          policyFile: args.policy as string | undefined,
          resume: args.resume as boolean,
          quiet: args.quiet as boolean,
          log: printError,
        });
        exitCode = outcome.exitCode === EXIT.fail && args['exit-zero'] ? EXIT.pass : outcome.exitCode;
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
    .demandCommand(1, 'name a command: run, check, gate, merge, report (footing --help lists them)')
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
