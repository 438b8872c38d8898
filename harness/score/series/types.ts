// Plot series of one run, as the report reads them: every per-tick signal reduced to at most
// MAX_SERIES_POINTS points (min and max per time bucket, so peaks survive), the scenario's friction
// map for the top view, footholds, slip segments and the loop-time distribution. Saved beside the
// results (series/<scenario>__<build>.json) for every run, with or without --trace.

import type { FrictionMap } from '../../plant/types.js';
import type { ScenarioEvent } from '../../scenario/events.js';

export const SERIES_FORMAT = 'footing-series';
export const SERIES_FORMAT_VERSION = 1;
/** Upper bound on points per plotted series (two per bucket: the bucket's min and max). */
export const MAX_SERIES_POINTS = 2000;
export const MAX_SERIES_BUCKETS = MAX_SERIES_POINTS / 2;
/** Footholds and slip segments kept per run; later ones are counted, not stored. */
export const MAX_FOOTHOLDS = 600;
export const MAX_SLIP_SEGMENTS = 400;
/** Largest raster (cells per side) stored for the top view; finer rasters are block-reduced. */
export const MAX_RASTER_CELLS_PER_SIDE = 96;

/** min/max per bucket; null where the bucket held no defined sample (e.g. a foot in swing). */
export interface MinMaxSeries {
  min: (number | null)[];
  max: (number | null)[];
}

export interface FootSeries {
  /** |f_t| / (μs·f_n) of the true ground force over loaded samples (1 − friction margin). */
  frictionUse: MinMaxSeries;
  normalForce_N: MinMaxSeries;
  /** Fraction of the bucket's ticks with the build's action in STANCE (0..1). */
  stance: number[];
  /** 1 when a loaded sample of the bucket slid faster than the slip speed. */
  slipping: (0 | 1)[];
  /** ∫ tangential speed dt over loaded samples, at the end of each bucket. */
  slipDistance_m: number[];
}

export interface Foothold {
  foot: number;
  t_s: number;
  x_m: number;
  y_m: number;
}

export interface SlipSegment {
  foot: number;
  start_s: number;
  end_s: number;
  /** Foot positions where the slip started and ended. */
  from_m: [number, number];
  to_m: [number, number];
  distance_m: number;
}

export interface GovernorAxisSeries {
  /** The part after `governor.target.` / `governor.applied.` (e.g. 'vx'). */
  axis: string;
  target: MinMaxSeries;
  applied: MinMaxSeries;
}

/** One named telemetry scalar of the build (Controller.telemetryNames), per bucket. */
export interface TelemetrySeries {
  name: string;
  /** Per-bucket min and max, 6 significant digits, clipped to ±TELEMETRY_PLOT_LIMIT. */
  values: MinMaxSeries;
  /** The run's exact extremes (unclipped, unrounded), null when no tick was recorded. */
  min: number | null;
  max: number | null;
}

/** Scenario events kept per series file (a recorded push series is one event; commands are few). */
export const MAX_SERIES_EVENTS = 1000;

/** Telemetry scalars plotted per run; names past this many are counted in dropped.telemetry. */
export const MAX_TELEMETRY_SERIES = 64;
/** The series bound of any plotted value (validate.ts); telemetry beyond it is clipped in plots. */
export const TELEMETRY_PLOT_LIMIT = 1e9;

export interface LoopTimeDistribution {
  /** Bin k covers [start_us·ratio^k, start_us·ratio^(k+1)). */
  start_us: number;
  ratio: number;
  /** Sparse [bin index, tick count] pairs, increasing index. */
  bins: [number, number][];
  ticks: number;
  budget_us: number;
}

export interface RunSeries {
  format: typeof SERIES_FORMAT;
  formatVersion: typeof SERIES_FORMAT_VERSION;
  scenario: { id: string; hash: string };
  build: string;
  footCount: number;
  loadedThreshold_N: number;
  slipSpeed_mps: number;
  controlPeriod_s: number;
  /** Control ticks per bucket. */
  bucketTicks: number;
  /** Time at the end of each bucket (the last tick recorded into it). */
  t_s: number[];
  feet: FootSeries[];
  /** Trunk and commanded reference position at the end of each bucket (world x, y). */
  trunk: { x_m: number[]; y_m: number[]; referenceX_m: number[]; referenceY_m: number[] };
  footholds: Foothold[];
  slips: SlipSegment[];
  /** Footholds and slip segments not stored because of the caps above. */
  dropped: { footholds: number; slips: number; telemetry?: number };
  governor: GovernorAxisSeries[];
  /** Every named telemetry scalar, in telemetryNames order (absent in files written before it). */
  telemetry?: TelemetrySeries[];
  loopTime: LoopTimeDistribution;
  /** The scenario's friction map (raster block-reduced to MAX_RASTER_CELLS_PER_SIDE). */
  friction: FrictionMap;
  /**
   * The scenario's pushes and command changes (scenario/events.ts) and its robot's leg names, so a
   * report re-rendered from saved results marks and labels them (absent in older files).
   */
  events?: ScenarioEvent[];
  legNames?: string[];
}
