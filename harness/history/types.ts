// The history of nights behind a small interface (HistoryStore), so the SQLite file of
// sqliteStore.ts could give way to a server database later without touching the commands, the
// trend report or the nightly script. A "night" is one results set (one `footing run`), however
// often it is run.

import type { ResultsFile, RunStatus } from '../results/types.js';

/** One results set in the store. */
export interface NightSummary {
  /** The results' identity (identity.ts): re-adding the same results finds this key. */
  identity: string;
  /** ISO 8601 start time of the run (results.json startedAt). */
  startedAt: string;
  /** The controller commit the night is filed under (see nightCommit in identity.ts); null when no build has one. */
  commit: string | null;
  toolVersion: string;
  builds: { name: string; commit: string | null }[];
  runs: number;
  passed: number;
  failed: number;
  errored: number;
  /** Where the results were read from (for people; not part of the identity). */
  source: string | null;
}

/** One night's value of one metric for one (scenario, build): a point of a trend line. */
export interface TrendPoint {
  startedAt: string;
  /** The night's commit (NightSummary.commit). */
  commit: string | null;
  /** The build's own commit that night (git builds), else null. */
  buildCommit: string | null;
  scenarioHash: string;
  scenarioRevision: number;
  status: RunStatus;
  /** null: the metric was not measured in that run (e.g. an error run, no loaded foot). */
  value: number | null;
}

export interface TrendQuery {
  scenario: string;
  build: string;
  metric: string;
}

/** One long-format row of `history export --csv`. */
export interface ExportRow {
  startedAt: string;
  commit: string | null;
  build: string;
  buildCommit: string | null;
  scenario: string;
  scenarioRevision: number;
  scenarioHash: string;
  status: RunStatus;
  metric: string;
  value: number;
}

export interface AddOutcome {
  /** false: these results were already in the store (nothing changed). */
  added: boolean;
  night: NightSummary;
}

export interface AddOptions {
  /** Overrides the night's commit (the nightly script passes the checkout's HEAD). */
  commit?: string;
  source?: string;
  /** Called inside the write transaction after every PROGRESS_EVERY_RUNS runs. */
  onProgress?: (runsWritten: number, runsTotal: number) => void;
}

export interface HistoryStore {
  /** Adds one results set in one transaction: all of it, or (killed, failed) none of it. */
  add(results: ResultsFile, options?: AddOptions): AddOutcome;
  /** Nights oldest first. */
  nights(): NightSummary[];
  /** Every (scenario, build) pair that has a run, sorted, for the report's choice of lines. */
  series(): { scenario: string; build: string }[];
  /** One line: oldest night first; nights without that run are absent. */
  trend(query: TrendQuery): TrendPoint[];
  /** Every stored metric value, oldest night first. */
  exportRows(): Iterable<ExportRow>;
  /** How much the store holds. */
  counts(): { nights: number; runs: number; values: number };
  /** The schema version of the open store (schema.ts). */
  schemaVersion(): number;
  close(): void;
}

/** A store that cannot be opened or written as asked (newer schema, not a store file): exit 2. */
export class HistoryStoreError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'HistoryStoreError';
  }
}
