// `footing bisect` without the CLI: the good commit built and run once as the reference, then the
// search of search.ts over the range, each probe built with the config's git-ref recipe
// (harness/builds/git.ts: a worktree per commit in the cache, reused by later bisects and nightlies)
// and run through the suite runner (its per-commit results folder is resumed on a rerun), judged by
// judge.ts. A build that fails is a skip; the good commit failing to build is bad input.

import path from 'node:path';
import { prepareGitBuild, type GitBuildRecipe } from '../../builds/git.js';
import { runSuite } from '../../commands/run.js';
import type { ResultsFile } from '../../results/types.js';
import { TREND_METRICS, runMetricValues } from '../metrics.js';
import { judgeResults, type Judge } from './judge.js';
import type { CommitRange } from './range.js';
import { bisectSearch, maxJudgements, type Verdict } from './search.js';
import { BISECT_FORMAT, BISECT_FORMAT_VERSION, type BisectCommit, type BisectRecord, type BisectRun } from './types.js';

export interface BisectOptions {
  range: CommitRange;
  goodRef: string;
  badRef: string;
  /** The config's recipe; ref and name are set per commit. */
  recipe: GitBuildRecipe;
  paths: string[];
  judge: Judge;
  outDir: string;
  jobs?: number;
  verifyBad?: boolean;
  runTimeout?: { base_s: number; perSimulatedSecond: number };
  cwd?: string;
  log?: (line: string) => void;
}

export class BisectInputError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'BisectInputError';
  }
}

function runsOf(results: ResultsFile): BisectRun[] {
  return results.runs.map((run) => {
    const values = new Map(runMetricValues(run));
    return { scenario: run.scenario.id, status: run.status, metrics: Object.fromEntries(TREND_METRICS.map((m) => [m.metric, values.get(m.metric) ?? null])) };
  });
}

export async function runBisect(options: BisectOptions): Promise<BisectRecord> {
  const log = options.log ?? (() => {});
  const { range } = options;
  const all = [range.good, ...range.commits];
  const n = range.commits.length;
  const tested: BisectCommit[] = [];
  let builds = 0;

  const attempt = async (index: number): Promise<{ results: ResultsFile | null; record: BisectCommit }> => {
    const { commit, subject } = all[index];
    builds++;
    const record: BisectCommit = { index, commit, subject, verdict: 'skip', reasons: [], cached: false, runs: [], results: null };
    tested.push(record);
    const built = await prepareGitBuild({ ...options.recipe, name: 'bisect', ref: commit });
    if (!built.ok) {
      record.reasons = [built.message, ...(built.outputTail ? [built.outputTail.split('\n').slice(-3).join(' | ')] : [])];
      log(`bisect: commit ${index}/${n} ${commit.slice(0, 12)} "${subject}": build failed, skipped (${built.message})`);
      return { results: null, record };
    }
    record.cached = built.origin.cached;
    const folder = path.join(options.outDir, 'commits', commit.slice(0, 12));
    const run = await runSuite({
      paths: options.paths,
      builds: [{ spec: built.spec, manifest: built.manifest }],
      outDir: folder,
      jobs: options.jobs,
      resume: true,
      quiet: true,
      runTimeout: options.runTimeout,
      cwd: options.cwd,
    });
    if (run.results === undefined) throw new BisectInputError(`bisect: the scenarios could not be run: ${run.lines.join('; ')}`);
    record.results = path.relative(options.outDir, folder);
    record.runs = runsOf(run.results);
    return { results: run.results, record };
  };

  const reference = await attempt(0);
  if (reference.results === null) {
    throw new BisectInputError(`--good ${options.goodRef} (${range.good.commit.slice(0, 12)}) does not build, so there is nothing to judge the other commits against: ${reference.record.reasons[0]}`);
  }
  reference.record.verdict = 'reference';
  const goodResults = reference.results;
  log(`bisect: good commit ${range.good.commit.slice(0, 12)} "${range.good.subject}" built and run as the reference (${goodResults.runs.length} runs); ${n} commits to search, at most ${maxJudgements(n) + 1} builds`);

  const judge = async (index: number): Promise<Verdict> => {
    const { results, record } = await attempt(index);
    if (results === null) return 'skip';
    const judgement = judgeResults(options.judge, goodResults, results);
    record.verdict = judgement.verdict;
    record.reasons = judgement.reasons;
    log(`bisect: commit ${index}/${n} ${record.commit.slice(0, 12)} "${record.subject}": ${judgement.verdict}${judgement.reasons.length > 0 ? ` (${judgement.reasons[0]}${judgement.reasons.length > 1 ? `, +${judgement.reasons.length - 1} more` : ''})` : ''}${record.cached ? ' [cached build]' : ''}`);
    return judgement.verdict;
  };
  const outcome = await bisectSearch(n, judge, { verifyBad: options.verifyBad });

  const at = (index: number) => ({ index, commit: all[index].commit, subject: all[index].subject });
  const badTested = tested.find((t) => t.index === (outcome.kind === 'found' ? outcome.firstBad : -1));
  return {
    format: BISECT_FORMAT,
    formatVersion: BISECT_FORMAT_VERSION,
    startedAt: new Date().toISOString(),
    good: { ref: options.goodRef, commit: range.good.commit, subject: range.good.subject },
    bad: { ref: options.badRef, commit: all[n].commit, subject: all[n].subject },
    judge: options.judge.text,
    scenarios: goodResults.runs.map((r) => r.scenario.id).filter((id, i, ids) => ids.indexOf(id) === i),
    rangeSize: n,
    outcome: outcome.kind,
    firstBad: outcome.kind === 'found' ? { ...at(outcome.firstBad), reasons: badTested?.reasons ?? ['not run: the commit named --bad is taken as bad (use --verify-bad to run it)'] } : null,
    candidates: outcome.kind === 'ambiguous' ? outcome.candidates.map(at) : [],
    notFoundReason: outcome.kind === 'notFound' ? outcome.reason : null,
    builds,
    buildBound: maxJudgements(n) + 1,
    skipped: tested.filter((t) => t.verdict === 'skip').map((t) => ({ ...at(t.index), message: t.reasons[0] ?? '' })),
    tested,
  };
}
