// `footing bench` as a function (the CLI stays thin): parse the build specs, load the scenario,
// run the bench, print the table, optionally write the JSON. Exit codes: 0 every build measured,
// 1 some build could not be measured (named in the output), 2 bad input.

import { mkdirSync } from 'node:fs';
import path from 'node:path';
import { DEFAULT_BENCH_SCENARIO, defaultBenchBuilds } from '../bench/defaults.js';
import { writeFileAtomicSync } from '../files/atomic.js';
import { prepareBuilds } from '../run/prepare.js';
import { loadScenarioFile } from '../scenario/load.js';
import { formatIssue } from '../files/issue.js';
import { DEFAULT_BENCH_TIME_ms, runBench } from '../bench/run.js';
import { renderBenchTable } from '../bench/table.js';
import type { BenchReport } from '../bench/types.js';
import { benchSuite, renderSuiteBench } from './benchSuite.js';
import { configuredSuite } from './configured.js';
import { EXIT } from './exit.js';
import type { CommandOutcome } from './skeleton.js';

export interface BenchCommandArgs {
  builds: string[];
  /** --config/--suite: the builds of footing.config.yaml (the suite's) as `run` reads them. */
  config?: string;
  suite?: string;
  scenario?: string;
  json?: string;
  time_ms?: number;
  /** Instead: wall time and peak memory of this many 10 s runs through the suite runner. */
  suiteRuns?: number;
  /** Folder specs and files are relative to (default process.cwd()). */
  cwd?: string;
  /** Also measure the speed targets (bench/targets.ts) and print them with their verdicts. */
  targets?: boolean;
}

export interface BenchCommandOutcome extends CommandOutcome {
  report?: BenchReport;
}

export async function runBenchCommand(args: BenchCommandArgs): Promise<BenchCommandOutcome> {
  const cwd = args.cwd ?? process.cwd();
  if (args.suiteRuns !== undefined) {
    if (!(Number.isInteger(args.suiteRuns) && args.suiteRuns > 0)) {
      return { exitCode: EXIT.badInput, lines: [`footing bench: --suite-runs ${args.suiteRuns}: expected a positive whole number`] };
    }
    return { exitCode: EXIT.pass, lines: renderSuiteBench(await benchSuite({ runs: args.suiteRuns })) };
  }
  if (args.time_ms !== undefined && !(Number.isFinite(args.time_ms) && args.time_ms > 0)) {
    return { exitCode: EXIT.badInput, lines: [`footing bench: --time-ms ${args.time_ms}: expected a positive number of milliseconds per task`] };
  }
  const configured = await configuredSuite('bench', { build: args.builds, config: args.config, suite: args.suite, cwd });
  if ('exitCode' in configured) return configured;
  const parsed = configured.builds.length > 0 ? prepareBuilds('bench', configured.builds, cwd) : { ok: true as const, value: defaultBenchBuilds() };
  if (!parsed.ok) return { exitCode: EXIT.badInput, lines: parsed.lines };
  const builds = parsed.value;

  const scenarioFile = args.scenario ? path.resolve(cwd, args.scenario) : DEFAULT_BENCH_SCENARIO;
  const loaded = await loadScenarioFile(scenarioFile, { cwd });
  if (!loaded.ok) return { exitCode: EXIT.badInput, lines: [`footing bench: --scenario ${scenarioFile}:`, ...loaded.errors.map(formatIssue)] };
  if (loaded.scenarios.length === 0) return { exitCode: EXIT.badInput, lines: [`footing bench: --scenario ${scenarioFile}: the file yields no scenario`] };
  const lines: string[] = [...configured.lines];
  if (loaded.scenarios.length > 1) {
    lines.push(`footing bench: ${scenarioFile} expands to ${loaded.scenarios.length} scenarios; benching the first, ${loaded.scenarios[0].id}`);
  }

  let report: BenchReport;
  try {
    report = await runBench({ scenario: loaded.scenarios[0], builds, time_ms: args.time_ms });
  } catch (error) {
    return { exitCode: EXIT.badInput, lines: [...lines, `footing bench: ${error instanceof Error ? error.message : String(error)}`] };
  }
  lines.push(...renderBenchTable(report));
  if (args.targets) {
    const { measureTargets, renderTargets } = await import('../bench/targets.js');
    const budget = { time_ms: args.time_ms ?? DEFAULT_BENCH_TIME_ms, iterations: 16 };
    lines.push(...renderTargets(await measureTargets(loaded.scenarios[0], report, budget, (line) => console.error(line))));
  }
  if (args.json) {
    const file = path.resolve(cwd, args.json);
    try {
      mkdirSync(path.dirname(file), { recursive: true });
      writeFileAtomicSync(file, `${JSON.stringify(report, null, 2)}\n`);
      lines.push(`bench figures written to ${file}`);
    } catch (error) {
      return { exitCode: EXIT.badInput, lines: [...lines, `footing bench: --json ${file}: cannot write it (${(error as Error).message})`], report };
    }
  }
  return { exitCode: report.failures.length > 0 ? EXIT.fail : EXIT.pass, lines, report };
}
