// The history store in one SQLite file through better-sqlite3 (12.x: a synchronous native binding,
// the fastest way to SQLite from Node 20; 13.x needs Node 22). Synchronous is what we want here:
// one results set is one transaction, and a transaction that is never committed — the process
// killed, the disk full — leaves the file as it was (SQLite's write-ahead log, sqlite.org/wal.html).

import { existsSync, mkdirSync } from 'node:fs';
import path from 'node:path';
import Database from 'better-sqlite3';
import type { ResultsFile } from '../results/types.js';
import { nightCommit, resultsIdentity } from './identity.js';
import { runMetricValues } from './metrics.js';
import { migrate, SCHEMA_VERSION } from './schema.js';
import { HistoryStoreError, type AddOptions, type AddOutcome, type ExportRow, type HistoryStore, type NightSummary, type TrendPoint, type TrendQuery } from './types.js';

/** Progress is reported this often while a large results set is written. */
export const PROGRESS_EVERY_RUNS = 1000;

interface NightRow {
  id: number;
  identity: string;
  started_at: string;
  commit_id: string | null;
  tool_version: string;
  source: string | null;
  runs: number;
  passed: number;
  failed: number;
  errored: number;
}

/** Opens (creating when missing, migrating when older) the store file. */
export function openSqliteStore(file: string, options: { readonly?: boolean } = {}): HistoryStore {
  if (options.readonly && !existsSync(file)) throw new HistoryStoreError(`${file}: no history store there yet (footing history add RESULTS… creates it)`);
  if (!options.readonly) mkdirSync(path.dirname(file), { recursive: true });
  let db: Database.Database;
  try {
    db = new Database(file, { readonly: options.readonly ?? false, fileMustExist: options.readonly ?? false });
    // WAL: readers (a report) never block the nightly writer; NORMAL sync is safe against a
    // killed process (a power cut may lose the last commit, never corrupt the file).
    if (!options.readonly) {
      db.pragma('journal_mode = WAL');
      db.pragma('synchronous = NORMAL');
    }
    db.pragma('foreign_keys = ON');
    if (options.readonly) {
      const version = db.pragma('user_version', { simple: true }) as number;
      if (version !== SCHEMA_VERSION) {
        throw new HistoryStoreError(`${file}: history store schema version ${version}, this Footing reads ${SCHEMA_VERSION}${version < SCHEMA_VERSION ? ' (run footing history add once to migrate it)' : ''}`);
      }
    } else {
      migrate(db, file);
    }
  } catch (error) {
    if (error instanceof HistoryStoreError) throw error;
    const code = (error as { code?: string }).code;
    if (code === 'SQLITE_NOTADB' || code === 'SQLITE_CORRUPT') {
      throw new HistoryStoreError(`${file}: not a history store (SQLite says: ${(error as Error).message}); name another --store file`);
    }
    throw new HistoryStoreError(`${file}: cannot open the history store (${(error as Error).message})`);
  }
  return new SqliteHistoryStore(db);
}

class SqliteHistoryStore implements HistoryStore {
  private readonly metricIds = new Map<string, number>();

  constructor(private readonly db: Database.Database) {}

  add(results: ResultsFile, options: AddOptions = {}): AddOutcome {
    const identity = resultsIdentity(results);
    const existing = this.db.prepare('SELECT * FROM nights WHERE identity = ?').get(identity) as NightRow | undefined;
    if (existing) return { added: false, night: this.summary(existing) };

    const insertNight = this.db.prepare(
      `INSERT INTO nights (identity, started_at, commit_id, tool_version, source, added_at, runs, passed, failed, errored)
       VALUES (@identity, @startedAt, @commit, @toolVersion, @source, @addedAt, @runs, @passed, @failed, @errored)`,
    );
    const insertBuild = this.db.prepare('INSERT INTO night_builds (night_id, position, name, commit_id, manifest) VALUES (?, ?, ?, ?, ?)');
    const findScenario = this.db.prepare('SELECT id FROM scenarios WHERE scenario = ? AND hash = ?').pluck();
    const insertScenario = this.db.prepare('INSERT INTO scenarios (scenario, revision, hash, title) VALUES (?, ?, ?, ?)');
    const insertRun = this.db.prepare('INSERT INTO runs (night_id, scenario, scenario_ref, build, build_commit, status, reasons) VALUES (?, ?, ?, ?, ?, ?, ?)');
    const insertValue = this.db.prepare('INSERT INTO metric_values (run_id, metric_id, value) VALUES (?, ?, ?)');

    const count = (status: string) => results.runs.filter((r) => r.status === status).length;
    const buildCommit = new Map(results.builds.map((b) => [b.name, typeof b.commit === 'string' ? b.commit : null]));
    const write = this.db.transaction(() => {
      const nightId = Number(
        insertNight.run({
          identity,
          startedAt: results.startedAt,
          commit: options.commit ?? nightCommit(results),
          toolVersion: results.toolVersion,
          source: options.source ?? null,
          addedAt: new Date().toISOString(),
          runs: results.runs.length,
          passed: count('pass'),
          failed: count('fail'),
          errored: count('error'),
        }).lastInsertRowid,
      );
      results.builds.forEach((b, i) => insertBuild.run(nightId, i, b.name, buildCommit.get(b.name) ?? null, JSON.stringify(b)));
      const scenarioIds = new Map<string, number>();
      results.runs.forEach((run, i) => {
        const key = `${run.scenario.id}\0${run.scenario.hash}`;
        let scenarioId = scenarioIds.get(key);
        if (scenarioId === undefined) {
          scenarioId = (findScenario.get(run.scenario.id, run.scenario.hash) as number | undefined)
            ?? Number(insertScenario.run(run.scenario.id, run.scenario.revision, run.scenario.hash, run.scenario.title).lastInsertRowid);
          scenarioIds.set(key, scenarioId);
        }
        const runId = insertRun.run(nightId, run.scenario.id, scenarioId, run.build, buildCommit.get(run.build) ?? null, run.status, JSON.stringify(run.reasons)).lastInsertRowid;
        for (const [name, value] of runMetricValues(run)) insertValue.run(runId, this.metricId(name), value);
        if ((i + 1) % PROGRESS_EVERY_RUNS === 0) options.onProgress?.(i + 1, results.runs.length);
      });
      return nightId;
    });
    try {
      const nightId = write();
      return { added: true, night: this.summary(this.db.prepare('SELECT * FROM nights WHERE id = ?').get(nightId) as NightRow) };
    } catch (error) {
      // The transaction rolled back; ids learned inside it may not exist.
      this.metricIds.clear();
      throw error;
    }
  }

  private metricId(name: string): number {
    let id = this.metricIds.get(name);
    if (id === undefined) {
      this.db.prepare('INSERT OR IGNORE INTO metric_names (name) VALUES (?)').run(name);
      id = this.db.prepare('SELECT id FROM metric_names WHERE name = ?').pluck().get(name) as number;
      this.metricIds.set(name, id);
    }
    return id;
  }

  private summary(row: NightRow): NightSummary {
    const builds = this.db.prepare('SELECT name, commit_id FROM night_builds WHERE night_id = ? ORDER BY position').all(row.id) as { name: string; commit_id: string | null }[];
    return {
      identity: row.identity,
      startedAt: row.started_at,
      commit: row.commit_id,
      toolVersion: row.tool_version,
      builds: builds.map((b) => ({ name: b.name, commit: b.commit_id })),
      runs: row.runs,
      passed: row.passed,
      failed: row.failed,
      errored: row.errored,
      source: row.source,
    };
  }

  nights(): NightSummary[] {
    const rows = this.db.prepare('SELECT * FROM nights ORDER BY started_at, id').all() as NightRow[];
    return rows.map((row) => this.summary(row));
  }

  series(): { scenario: string; build: string }[] {
    return this.db.prepare('SELECT scenario, build FROM runs GROUP BY scenario, build ORDER BY scenario, build').all() as { scenario: string; build: string }[];
  }

  trend(query: TrendQuery): TrendPoint[] {
    const metricId = this.db.prepare('SELECT id FROM metric_names WHERE name = ?').pluck().get(query.metric) as number | undefined;
    const rows = this.db
      .prepare(
        `SELECT n.started_at AS startedAt, n.commit_id AS commitId, r.build_commit AS buildCommit, s.hash AS hash,
                s.revision AS revision, r.status AS status, v.value AS value
         FROM runs r
         JOIN nights n ON n.id = r.night_id
         JOIN scenarios s ON s.id = r.scenario_ref
         LEFT JOIN metric_values v ON v.run_id = r.id AND v.metric_id = ?
         WHERE r.scenario = ? AND r.build = ?
         ORDER BY n.started_at, n.id`,
      )
      .all(metricId ?? -1, query.scenario, query.build) as { startedAt: string; commitId: string | null; buildCommit: string | null; hash: string; revision: number; status: TrendPoint['status']; value: number | null }[];
    return rows.map((r) => ({
      startedAt: r.startedAt,
      commit: r.commitId,
      buildCommit: r.buildCommit,
      scenarioHash: r.hash,
      scenarioRevision: r.revision,
      status: r.status,
      value: r.value,
    }));
  }

  *exportRows(): Iterable<ExportRow> {
    const statement = this.db.prepare(
      `SELECT n.started_at AS startedAt, n.commit_id AS commitId, r.build AS build, r.build_commit AS buildCommit,
              r.scenario AS scenario, s.revision AS revision, s.hash AS hash, r.status AS status, m.name AS metric, v.value AS value
       FROM nights n
       JOIN runs r ON r.night_id = n.id
       JOIN scenarios s ON s.id = r.scenario_ref
       JOIN metric_values v ON v.run_id = r.id
       JOIN metric_names m ON m.id = v.metric_id
       ORDER BY n.started_at, n.id, r.id, m.name`,
    );
    for (const r of statement.iterate() as Iterable<{ startedAt: string; commitId: string | null; build: string; buildCommit: string | null; scenario: string; revision: number; hash: string; status: ExportRow['status']; metric: string; value: number }>) {
      yield { startedAt: r.startedAt, commit: r.commitId, build: r.build, buildCommit: r.buildCommit, scenario: r.scenario, scenarioRevision: r.revision, scenarioHash: r.hash, status: r.status, metric: r.metric, value: r.value };
    }
  }

  counts(): { nights: number; runs: number; values: number } {
    const count = (table: string) => this.db.prepare(`SELECT count(*) FROM ${table}`).pluck().get() as number;
    return { nights: count('nights'), runs: count('runs'), values: count('metric_values') };
  }

  schemaVersion(): number {
    return this.db.pragma('user_version', { simple: true }) as number;
  }

  close(): void {
    this.db.close();
  }
}
