// bisect.json: the record of one `footing bisect` (format documented in docs/history.md).

export const BISECT_FORMAT = 'footing-bisect';
export const BISECT_FORMAT_VERSION = 1;

export interface BisectRun {
  scenario: string;
  status: 'pass' | 'fail' | 'error';
  /** The trend metrics (metrics.ts TREND_METRICS) of this run; null when not measured. */
  metrics: Record<string, number | null>;
}

export interface BisectCommit {
  /** Position in the range: 0 the good commit, n the bad one. */
  index: number;
  commit: string;
  subject: string;
  verdict: 'good' | 'bad' | 'skip' | 'reference';
  /** Why bad (broken rules), why skipped (the build's message), empty when good. */
  reasons: string[];
  /** The build came from the cache of an earlier run. */
  cached: boolean;
  runs: BisectRun[];
  /** Results folder of this commit's runs, relative to bisect.json. */
  results: string | null;
}

export interface BisectRecord {
  format: typeof BISECT_FORMAT;
  formatVersion: typeof BISECT_FORMAT_VERSION;
  startedAt: string;
  good: { ref: string; commit: string; subject: string };
  bad: { ref: string; commit: string; subject: string };
  /** How commits were judged: 'gate policy', a rule name or a threshold. */
  judge: string;
  scenarios: string[];
  /** Commits after the good one up to the bad one. */
  rangeSize: number;
  outcome: 'found' | 'ambiguous' | 'notFound';
  firstBad: { index: number; commit: string; subject: string; reasons: string[] } | null;
  /** ambiguous: the commits the first bad one may be (skipped ones and the first bad tested). */
  candidates: { index: number; commit: string; subject: string }[];
  notFoundReason: string | null;
  /** Builds attempted, the good commit's included (skips count: they were attempted). */
  builds: number;
  /** ⌈log₂ rangeSize⌉ + 1: the most builds a search with no skip needs. */
  buildBound: number;
  skipped: { index: number; commit: string; subject: string; message: string }[];
  /** Every commit built, in the order tested (the good commit first). */
  tested: BisectCommit[];
}
