// The store's schema as numbered migrations, applied in order inside one transaction each and
// recorded in SQLite's `PRAGMA user_version`. Never edit a released migration: add the next one.
// A store newer than this code knows is refused (HistoryStoreError), never guessed at.
//
// Layout: one row per results set (`nights`), its builds, one row per run, and the run's metrics
// in a narrow (run, metric, value) table without row ids — the long shape keeps "every metric"
// without a column per metric, and the (scenario, build, night) index makes a trend one index walk.

import type Database from 'better-sqlite3';
import { HistoryStoreError } from './types.js';

export interface Migration {
  version: number;
  description: string;
  sql: string;
}

export const MIGRATIONS: readonly Migration[] = [
  {
    version: 1,
    description: 'nights, builds, scenarios, runs, metric names, metric values',
    sql: `
      CREATE TABLE nights (
        id INTEGER PRIMARY KEY,
        identity TEXT NOT NULL UNIQUE,
        started_at TEXT NOT NULL,
        commit_id TEXT,
        tool_version TEXT NOT NULL,
        source TEXT,
        added_at TEXT NOT NULL,
        runs INTEGER NOT NULL,
        passed INTEGER NOT NULL,
        failed INTEGER NOT NULL,
        errored INTEGER NOT NULL
      );
      CREATE INDEX nights_by_time ON nights (started_at, id);
      CREATE TABLE night_builds (
        night_id INTEGER NOT NULL REFERENCES nights (id),
        position INTEGER NOT NULL,
        name TEXT NOT NULL,
        commit_id TEXT,
        manifest TEXT NOT NULL,
        PRIMARY KEY (night_id, position)
      ) WITHOUT ROWID;
      CREATE TABLE scenarios (
        id INTEGER PRIMARY KEY,
        scenario TEXT NOT NULL,
        revision INTEGER NOT NULL,
        hash TEXT NOT NULL,
        title TEXT NOT NULL,
        UNIQUE (scenario, hash)
      );
      CREATE TABLE metric_names (
        id INTEGER PRIMARY KEY,
        name TEXT NOT NULL UNIQUE
      );
      CREATE TABLE runs (
        id INTEGER PRIMARY KEY,
        night_id INTEGER NOT NULL REFERENCES nights (id),
        scenario TEXT NOT NULL,
        scenario_ref INTEGER NOT NULL REFERENCES scenarios (id),
        build TEXT NOT NULL,
        build_commit TEXT,
        status TEXT NOT NULL CHECK (status IN ('pass', 'fail', 'error')),
        reasons TEXT NOT NULL
      );
      CREATE INDEX runs_by_series ON runs (scenario, build, night_id);
      CREATE TABLE metric_values (
        run_id INTEGER NOT NULL REFERENCES runs (id),
        metric_id INTEGER NOT NULL REFERENCES metric_names (id),
        value REAL NOT NULL,
        PRIMARY KEY (run_id, metric_id)
      ) WITHOUT ROWID;
    `,
  },
];

export const SCHEMA_VERSION = MIGRATIONS[MIGRATIONS.length - 1].version;

/** Brings the store to SCHEMA_VERSION; returns the versions applied. */
export function migrate(db: Database.Database, file: string): number[] {
  const current = db.pragma('user_version', { simple: true }) as number;
  if (current > SCHEMA_VERSION) {
    throw new HistoryStoreError(`${file}: history store schema version ${current} is newer than this Footing knows (${SCHEMA_VERSION}); use a newer Footing or another --store file`);
  }
  const applied: number[] = [];
  for (const migration of MIGRATIONS) {
    if (migration.version <= current) continue;
    db.transaction(() => {
      db.exec(migration.sql);
      db.pragma(`user_version = ${migration.version}`);
    })();
    applied.push(migration.version);
  }
  return applied;
}
