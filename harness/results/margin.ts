// What the margin search and scenario families add to results.json (format version 2): a
// `margin` object on a run, a `family` membership on its scenario, and a `families` summary list.
// JSON Schema: harness/results/results.schema.json ($defs/margin, $defs/familySummary).

// The search's own result shape (harness/margin/search.ts fills it) lives here, below the search,
// so that the result file types need nothing of the margin engine.
export type ProbeStatus = 'pass' | 'fail' | 'error';

export type SampleRole = 'nominal' | 'end' | 'bisection' | 'check';

export interface SearchSample<D> {
  scale: number;
  status: ProbeStatus;
  role: SampleRole;
  detail: D;
}

export type SearchOutcomeKind = 'found' | 'passesWholeRange' | 'failsWholeRange';

export interface SearchResult<D> {
  outcome: SearchOutcomeKind;
  /** Conservative critical scale (rules in the header of harness/margin/search.ts); at a range end for 'passesWholeRange'; null for 'failsWholeRange'. */
  critical: number | null;
  /** Closest failing and passing scales around the critical one; null unless 'found'. */
  bracket: { failing: number; passing: number } | null;
  /** The half of the search range that was searched. */
  range: [number, number];
  tolerance: number;
  monotone: boolean;
  /** Probes made (= samples.length). */
  runs: number;
  bisectionRuns: number;
  /** Every probe, sorted by scale. */
  samples: SearchSample<D>[];
}

/** One probe of a margin search, with the metrics that explain its outcome. */
export interface MarginSample {
  scale: number;
  status: ProbeStatus;
  role: SampleRole;
  slipDistance_m: number | null;
  frictionMarginMin: number | null;
  fell: boolean | null;
  /** The acceptance sentences of a failing probe (empty for a pass). */
  reasons: string[];
}

/**
 * A search as results.json stores it: the search's own result (search.ts) with the critical scale
 * under its results name, the search's wall time, and flat samples.
 */
export interface MarginSearchRecord extends Omit<SearchResult<unknown>, 'critical' | 'samples'> {
  /** criticalFrictionScale or criticalPushScale; see docs/margin.md for range ends and null. */
  criticalScale: number | null;
  /** Wall time of the whole search (sequential probes), s. */
  wall_s: number;
  samples: MarginSample[];
}

export interface FrictionMarginRecord extends MarginSearchRecord {
  /** Lowest μs of any material of the scenario as written. */
  lowestStaticFriction: number;
  /** criticalScale × lowestStaticFriction: the critical μs of the slipperiest material. */
  criticalStaticFriction: number | null;
}

export interface PushMarginRecord extends MarginSearchRecord {
  /** Largest push peak force of the scenario as written, N. */
  peakForce_N: number;
  /** criticalScale × peakForce_N. */
  criticalPeakForce_N: number | null;
}

export interface RunMargin {
  friction: FrictionMarginRecord | null;
  push: PushMarginRecord | null;
  /** Why a search is missing (no pushes, nominal run errored, not asked for). */
  notes: string[];
}

/** Quantiles of a per-sample metric over a family's runs (linear interpolation, Hyndman & Fan type 7). */
export interface Spread {
  count: number;
  min: number;
  p10: number;
  median: number;
  p90: number;
  max: number;
}

export interface FamilySummary {
  /** Family id (the id written in the scenario file). */
  id: string;
  build: string;
  file: string;
  /** Samples the family declares. */
  samples: number;
  /** Sample runs present in this result set (fewer in a shard). */
  runs: number;
  successes: number;
  /** Error runs (counted as not successful). */
  errors: number;
  successRate: number;
  interval: { method: 'wilson'; confidence: number; lower: number; upper: number };
  /** sha256 over the sample hashes in sample order: equal only for the same family content. */
  hash: string;
  frictionMarginMin: Spread | null;
  slipDistance_m: Spread | null;
  /** Present when the samples carry margin searches. */
  criticalFrictionScale?: Spread | null;
}
