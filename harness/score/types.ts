// What the scorer hands back for one run. Every number is finite or null, so the object is plain
// JSON (results.json stores it as is; its schema is harness/results/results.schema.json).

export interface MarginStats {
  /** Smallest per-sample margin 1 − |f_t|/(μs·f_n) over loaded samples; null if never loaded. */
  min: number | null;
  /** 5th percentile of the same samples (histogram estimate, within MARGIN_BIN_WIDTH / 2). */
  p05: number | null;
  /** Number of (physics step, foot) samples with the foot loaded. */
  loadedSamples: number;
}

export interface FrictionMarginMetrics extends MarginStats {
  perFoot: MarginStats[];
}

/** Mean, 95th percentile (exact, type 7) and maximum of a set of values; null when empty. */
export interface Spread {
  mean: number | null;
  p95: number | null;
  max: number | null;
}

/** What the touchdowns of a foot (or of all feet) did; see score/touchdown.ts. */
export interface TouchdownStats {
  /** Touchdowns: first loaded steps after the foot was out of contact. */
  count: number;
  /** Slip ∫|v_t| dt over each touchdown's loaded transient steps, per touchdown. */
  slip_m: Spread;
  /** |v_t| at each touchdown's first step in contact. */
  landingTangentialSpeed_mps: Spread;
  /** −v_z (downward positive) at each touchdown's first step in contact. */
  landingVerticalSpeed_mps: Spread;
  /** Largest normal force in each touchdown's transient. */
  impactPeakForce_N: Spread;
}

export interface TouchdownMetrics extends TouchdownStats {
  /** The transient's length (TOUCHDOWN_TRANSIENT_s). */
  transient_s: number;
  perFoot: TouchdownStats[];
}

export interface ViolationCounts {
  /** Intervals in which a stance foot's wanted force is outside the true friction cone or pulls. */
  commanded: number;
  commandedTime_s: number;
  /** Intervals in which a loaded foot slides faster than the slip speed. */
  slip: number;
  slipTime_s: number;
}

/** Totals count intervals of the union over feet (any foot in violation), see docs/scoring.md. */
export interface ViolationMetrics extends ViolationCounts {
  perFoot: ViolationCounts[];
}

export type FallReason = 'trunkContact' | 'trunkTilted' | 'trunkLow';

export interface LoopTimeMetrics {
  /** Histogram estimates (log bins, within ≈ 0.5 %); null when no tick was timed. */
  p50: number | null;
  p99: number | null;
  /** Exact. */
  max: number | null;
  /** The scenario's loop budget. */
  budget: number;
  /** Ticks whose loop time exceeded the budget. */
  overruns: number;
}

export interface ScoreMetrics {
  /** Control ticks scored. */
  ticks: number;
  /** Physics steps scored (optional: results written before per-step scoring lack it). */
  steps?: number;
  loadedThreshold_N: number;
  slipSpeed_mps: number;
  /** Over every loaded physics step, touchdown transients included. */
  frictionMargin: FrictionMarginMetrics;
  /**
   * Over loaded steps in stance only, after each touchdown's transient (score/touchdown.ts).
   * Optional: results written before it existed lack it (the scorer always fills it).
   */
  stanceMargin?: FrictionMarginMetrics;
  /** Touchdowns and their transients (optional for the same reason). */
  touchdown?: TouchdownMetrics;
  violations: ViolationMetrics;
  /** ∫ tangential foot speed dt over loaded samples, summed over feet. */
  slipDistance_m: number;
  slipDistancePerFoot_m: number[];
  fell: boolean;
  fellAt_s: number | null;
  fallReason: FallReason | null;
  /** RMS of the horizontal distance between trunk and reference position; null with no ticks. */
  trackingRms_m: number | null;
  /** Length of the horizontal travel the scenario's commands ask for over its whole duration. */
  commandedTravel_m: number;
  /** Trunk's horizontal travel projected on the commanded direction ÷ commanded travel; null when
   * the commanded travel is below MIN_COMMANDED_TRAVEL_m. */
  progress: number | null;
  loopTime_us: LoopTimeMetrics;
}

export interface SimMetrics {
  /** Simulated time covered by the scored ticks (less than the scenario's when stopped early). */
  duration_s: number;
  wall_s: number;
  /** duration_s / wall_s; null when wall_s is 0. */
  realTimeFactor: number | null;
  physicsStep_s: number;
  controlRate_Hz: number;
  totalMass_kg: number;
}

/** What the episode loop tells the scorer at the end of a run. */
export interface SimInfo {
  wall_s: number;
  /** Simulated duration; defaults to the time of the last recorded tick. */
  duration_s?: number;
}

/** The scorer's answer: the `sim` and `metrics` fields of a run result. */
export interface RunMetrics {
  sim: SimMetrics;
  metrics: ScoreMetrics;
}
