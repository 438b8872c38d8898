// `footing bisect --good REF --bad REF [paths..]` as a function returning { exitCode, lines }:
// resolves the config (its git recipe, cache, gate policy, suite or paths), the range and the
// judge — any problem is exit 2 with nothing built — then bisects and writes bisect.json and
// bisect.md atomically. Exit 0 the first bad commit found, 1 not found or ambiguous, 2 bad input.

import path from 'node:path';
import { GitRefError } from '../../builds/git.js';
import { resolveSettings, settingsErrorLines, type ResolvedSettings } from '../../config/resolve.js';
import { defaultPolicy, type GatePolicy } from '../../gate/defaults.js';
import { loadPolicy, PolicyError } from '../../gate/policy.js';
import { writeFileAtomicSync } from '../../files/atomic.js';
import { prepareScenarios } from '../../run/prepare.js';
import { displayPath } from '../../scenario/paths.js';
import { BisectInputError, runBisect } from './engine.js';
import { JudgeError, parseJudge, type Judge } from './judge.js';
import { commitRange, type CommitRange } from './range.js';
import { renderBisectMarkdown } from './render.js';
import type { BisectRecord } from './types.js';

export const BISECT_EXIT = { found: 0, notFound: 1, badInput: 2 } as const;
export const BISECT_JSON = 'bisect.json';
export const BISECT_MARKDOWN = 'bisect.md';

export interface BisectArgs {
  good: string;
  bad: string;
  paths?: string[];
  suite?: string;
  config?: string;
  policy?: string;
  rule?: string;
  out?: string;
  jobs?: number;
  verifyBad?: boolean;
  cwd?: string;
  log?: (line: string) => void;
  /** Passed to the suite runner (tests shorten it). */
  runTimeout?: { base_s: number; perSimulatedSecond: number };
}

export async function runBisectCommand(args: BisectArgs): Promise<{ exitCode: 0 | 1 | 2; lines: string[]; record?: BisectRecord }> {
  const cwd = args.cwd ?? process.cwd();
  const lines: string[] = [];
  const log = (line: string) => {
    lines.push(line);
    args.log?.(line);
  };
  const bad = (...problem: string[]) => {
    for (const line of problem) log(line);
    log('footing bisect: nothing was built');
    return { exitCode: BISECT_EXIT.badInput, lines };
  };
  if (!args.good || !args.bad) return bad('footing bisect: give both --good REF and --bad REF');
  let settings: ResolvedSettings;
  try {
    settings = resolveSettings({ config: args.config, suite: args.suite, paths: args.paths, builds: [`bisect=git:${args.good}`], policy: args.policy, jobs: args.jobs, cwd });
  } catch (error) {
    const problem = settingsErrorLines(error);
    if (problem === null) throw error;
    return bad(...problem);
  }
  const build = settings.builds[0];
  if (build?.kind !== 'git') return bad('footing bisect: the config needs a git recipe (git: { build: …, entry: … }) to build commits (docs/config.md)');
  let policy: GatePolicy;
  let judge: Judge;
  let range: CommitRange;
  try {
    policy = settings.policy.value.file ? loadPolicy(settings.policy.value.file) : (settings.policy.value.inline ?? defaultPolicy());
    judge = parseJudge(args.rule, policy);
    range = await commitRange(build.recipe.repo, args.good, args.bad);
  } catch (error) {
    if (error instanceof PolicyError || error instanceof JudgeError || error instanceof GitRefError) return bad(`footing bisect: ${error.message}`);
    throw error;
  }
  // The scenarios are checked before anything is built: a typo should not cost a build.
  const scenarios = await prepareScenarios('bisect', settings.paths.value, cwd);
  if (!scenarios.ok) return bad(...scenarios.lines.filter((line) => !line.startsWith('footing bisect: nothing was run')));
  if (range.commits.length === 0) return bad(`footing bisect: --good ${args.good} and --bad ${args.bad} are the same commit (${range.good.commit.slice(0, 12)})`);
  const outDir = args.out !== undefined ? path.resolve(cwd, args.out) : path.join(path.dirname(settings.out.value), 'bisect');

  let record: BisectRecord;
  try {
    record = await runBisect({ range, goodRef: args.good, badRef: args.bad, recipe: build.recipe, paths: settings.paths.value, judge, outDir, jobs: settings.jobs.value, verifyBad: args.verifyBad, runTimeout: args.runTimeout, cwd, log });
  } catch (error) {
    if (error instanceof BisectInputError) return bad(`footing bisect: ${error.message}`);
    throw error;
  }
  writeFileAtomicSync(path.join(outDir, BISECT_JSON), `${JSON.stringify(record, null, 2)}\n`);
  writeFileAtomicSync(path.join(outDir, BISECT_MARKDOWN), renderBisectMarkdown(record));
  const where = displayPath(path.join(outDir, BISECT_JSON), cwd);
  if (record.outcome === 'found' && record.firstBad) {
    log(`footing bisect: first bad commit ${record.firstBad.commit.slice(0, 12)} "${record.firstBad.subject}" after ${record.builds} builds${record.skipped.length > 0 ? `, ${record.skipped.length} skipped (${record.skipped.map((s) => s.commit.slice(0, 12)).join(', ')})` : ''} — ${where}`);
    return { exitCode: BISECT_EXIT.found, lines, record };
  }
  log(record.outcome === 'ambiguous'
    ? `footing bisect: ambiguous — the first bad commit is one of ${record.candidates.map((c) => c.commit.slice(0, 12)).join(', ')} (skipped commits did not build) — ${where}`
    : `footing bisect: not found — ${record.notFoundReason} — ${where}`);
  return { exitCode: BISECT_EXIT.notFound, lines, record };
}
