// The `footing history …` verbs as functions returning { exitCode, lines } (the CLI prints them):
// add, list, export --csv, report. Exit 0 done, 2 bad input (unreadable results, a store that is
// not one or is newer than this Footing, bad flags) with nothing written.

import path from 'node:path';
import { writeFileAtomicSync } from '../files/atomic.js';
import { readResultsFile, ResultsReadError } from '../results/read.js';
import type { ResultsFile } from '../results/types.js';
import { displayPath } from '../scenario/paths.js';
import { CSV_HEADER, csvLine } from './csv.js';
import { prepareStoreFolder } from './location.js';
import { TREND_METRICS } from './metrics.js';
import { resolveProject, type ProjectFlags } from './project.js';
import { renderTrendPage } from './render.js';
import { openSqliteStore } from './sqliteStore.js';
import { buildTrendModel } from './trend.js';
import { HistoryStoreError, type HistoryStore, type NightSummary } from './types.js';

export const HISTORY_EXIT = { ok: 0, fail: 1, badInput: 2 } as const;
export type HistoryExit = (typeof HISTORY_EXIT)[keyof typeof HISTORY_EXIT];

export interface HistoryOutcome {
  exitCode: HistoryExit;
  lines: string[];
}

function withStore(flags: ProjectFlags, readonly: boolean, use: (store: HistoryStore, file: string, project: Extract<ReturnType<typeof resolveProject>, { ok: true }>) => HistoryOutcome): HistoryOutcome {
  const project = resolveProject(flags);
  if (!project.ok) return { exitCode: HISTORY_EXIT.badInput, lines: project.lines };
  let store: HistoryStore;
  try {
    if (!readonly) prepareStoreFolder(project.store);
    store = openSqliteStore(project.store, { readonly });
  } catch (error) {
    if (error instanceof HistoryStoreError) return { exitCode: HISTORY_EXIT.badInput, lines: [`footing history: ${error.message}`] };
    throw error;
  }
  try {
    return use(store, project.store, project);
  } finally {
    store.close();
  }
}

const short = (commit: string | null) => (commit === null ? '(no commit)' : commit.slice(0, 12));

function describeNight(night: NightSummary): string {
  return `${night.startedAt} ${short(night.commit)} · ${night.runs} runs (${night.passed} pass, ${night.failed} fail, ${night.errored} error) · builds ${night.builds.map((b) => b.name).join(', ')}`;
}

export interface HistoryAddArgs extends ProjectFlags {
  results: string[];
  /** File the nights under this commit (the nightly script passes its checkout's HEAD). */
  commit?: string;
  /** Progress while a large set is written (the returned lines say what was done). */
  log?: (line: string) => void;
}

/** `footing history add RESULTS…`: every results set read first (any unreadable: exit 2, nothing added), then one transaction each. */
export function historyAdd(args: HistoryAddArgs): HistoryOutcome {
  const cwd = args.cwd ?? process.cwd();
  if (args.results.length === 0) return { exitCode: HISTORY_EXIT.badInput, lines: ['footing history add: name at least one results.json or results folder'] };
  if (args.commit !== undefined && !/^[0-9a-f]{7,64}$/.test(args.commit)) {
    return { exitCode: HISTORY_EXIT.badInput, lines: [`footing history add: --commit ${JSON.stringify(args.commit)}: expected a commit id (7 to 64 hexadecimal digits)`] };
  }
  const sets: { label: string; results: ResultsFile }[] = [];
  try {
    for (const p of args.results) {
      const read = readResultsFile(path.resolve(cwd, p));
      sets.push({ label: displayPath(read.file, cwd), results: read.results });
    }
  } catch (error) {
    if (error instanceof ResultsReadError) return { exitCode: HISTORY_EXIT.badInput, lines: [`footing history add: ${error.message}`, 'footing history add: nothing was added'] };
    throw error;
  }
  return addResultSets(sets, args);
}

/** The add step shared by `history add` and `run --history`: results already read. */
export function addResultSets(sets: { label: string; results: ResultsFile }[], args: ProjectFlags & { commit?: string; log?: (line: string) => void }): HistoryOutcome {
  const cwd = args.cwd ?? process.cwd();
  return withStore(args, false, (store, file) => {
    const lines: string[] = [];
    const say = (line: string) => lines.push(line);
    for (const set of sets) {
      const source = set.label;
      say(`history: adding ${source} (${set.results.runs.length} runs) to ${displayPath(file, cwd)}`);
      const outcome = store.add(set.results, {
        commit: args.commit,
        source,
        onProgress: (done, total) => args.log?.(`history: ${done}/${total} runs written`),
      });
      say(outcome.added ? `history: added night ${describeNight(outcome.night)}` : `history: already in the store, nothing changed: ${describeNight(outcome.night)}`);
    }
    return { exitCode: HISTORY_EXIT.ok, lines };
  });
}

export interface HistoryListArgs extends ProjectFlags {
  json?: boolean;
  /** Print only the commit of the newest night whose runs all passed (exit 1 when there is none). */
  lastGood?: boolean;
}

export function historyList(args: HistoryListArgs): HistoryOutcome {
  return withStore(args, true, (store, file) => {
    const nights = store.nights();
    if (args.lastGood) {
      const good = [...nights].reverse().find((n) => n.runs > 0 && n.passed === n.runs && n.commit !== null);
      return good ? { exitCode: HISTORY_EXIT.ok, lines: [good.commit as string] } : { exitCode: HISTORY_EXIT.fail, lines: [`footing history: no night in ${file} passed every run (or none names a commit)`] };
    }
    if (args.json) return { exitCode: HISTORY_EXIT.ok, lines: JSON.stringify({ store: file, schemaVersion: store.schemaVersion(), nights }, null, 2).split('\n') };
    return { exitCode: HISTORY_EXIT.ok, lines: [`${nights.length} night${nights.length === 1 ? '' : 's'} in ${displayPath(file, args.cwd ?? process.cwd())}`, ...nights.map(describeNight)] };
  });
}

export interface HistoryExportArgs extends ProjectFlags {
  csv: boolean;
  /** File to write (atomically); omitted: the CSV lines are returned to print. */
  out?: string;
}

export function historyExport(args: HistoryExportArgs): HistoryOutcome {
  if (!args.csv) return { exitCode: HISTORY_EXIT.badInput, lines: ['footing history export: name the format: --csv (the only one so far)'] };
  return withStore(args, true, (store) => {
    const rows = [CSV_HEADER.join(',')];
    for (const row of store.exportRows()) rows.push(csvLine(row));
    if (args.out === undefined) return { exitCode: HISTORY_EXIT.ok, lines: rows };
    const out = path.resolve(args.cwd ?? process.cwd(), args.out);
    writeFileAtomicSync(out, `${rows.join('\n')}\n`);
    return { exitCode: HISTORY_EXIT.ok, lines: [`history: wrote ${rows.length - 1} metric values to ${displayPath(out, args.cwd ?? process.cwd())}`] };
  });
}

export interface HistoryReportArgs extends ProjectFlags {
  out: string;
  scenarios?: string[];
  builds?: string[];
  metrics?: string[];
  last?: number;
  alpha?: number;
}

export function historyReport(args: HistoryReportArgs): HistoryOutcome {
  const cwd = args.cwd ?? process.cwd();
  if (!args.out || !/\.html?$/.test(args.out)) return { exitCode: HISTORY_EXIT.badInput, lines: [`footing history report: --out ${args.out ?? ''}: expected an .html file name`] };
  const known = TREND_METRICS.map((m) => m.metric) as string[];
  const unknown = (args.metrics ?? []).filter((m) => !known.includes(m));
  if (unknown.length > 0) return { exitCode: HISTORY_EXIT.badInput, lines: [`footing history report: --metric ${unknown.join(', ')}: not a trend metric (expected one of ${known.join(', ')})`] };
  if (args.last !== undefined && !(Number.isInteger(args.last) && args.last >= 2)) return { exitCode: HISTORY_EXIT.badInput, lines: [`footing history report: --last ${args.last}: expected a whole number of nights ≥ 2`] };
  if (args.alpha !== undefined && !(args.alpha > 0 && args.alpha < 1)) return { exitCode: HISTORY_EXIT.badInput, lines: [`footing history report: --alpha ${args.alpha}: expected a significance level between 0 and 1`] };
  return withStore(args, true, (store, _file, project) => {
    const model = buildTrendModel(store, {
      policy: project.policy,
      scenarios: args.scenarios,
      builds: args.builds,
      metrics: args.metrics,
      last: args.last,
      changePoints: args.alpha === undefined ? undefined : { alpha: args.alpha },
    });
    const html = renderTrendPage(model);
    const out = path.resolve(cwd, args.out);
    writeFileAtomicSync(out, html);
    const lines = model.scenarios.flatMap((s) =>
      s.lines.flatMap((l) => l.changes.map((c) => `change point: ${s.id} · ${l.build} · ${l.metric}: ${c.shift} between ${c.before.date} ${c.before.commit} and ${c.after.date} ${c.after.commit} (p = ${c.p})`)),
    );
    lines.push(`history report: ${model.nights.length} nights, ${model.scenarios.reduce((n, s) => n + s.lines.length, 0)} trend lines, ${model.changeCount} change point${model.changeCount === 1 ? '' : 's'} → ${displayPath(out, cwd)} (${Math.round(html.length / 1024)} KB)`);
    return { exitCode: HISTORY_EXIT.ok, lines };
  });
}

/** `footing run --history`: the run's results added as one night (labelled by the run, not a file). */
export function addRunToHistory(results: ResultsFile, flags: ProjectFlags & { commit?: string }): HistoryOutcome {
  return addResultSets([{ label: `footing run of ${results.startedAt}`, results }], flags);
}
