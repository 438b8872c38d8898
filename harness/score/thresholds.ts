// The scorer's thresholds: the one place these numbers live. The gate, the trace writer and the
// docs (docs/scoring.md) refer to them by name.

import { STANDARD_GRAVITY_mps2 } from '../plant/defaults.js';
import type { RobotParams } from '../plant/types.js';

/**
 * A foot is "loaded" when its normal force exceeds this fraction of the robot's weight. Common
 * practice: a few percent of body weight separates real support from contact-model chatter and
 * the light touch of a landing swing foot, and stays well below a quadruped's per-foot share
 * (~25 % standing, ~50 % trotting).
 */
export const DEFAULT_LOADED_FRACTION = 0.05;

/**
 * A loaded foot slips when its tangential speed exceeds this. Common practice: 2 cm/s is far above
 * the micro-creep of a penalty (spring-damper) contact holding a foot, and far below a sliding foot.
 */
export const DEFAULT_SLIP_SPEED_mps = 0.02;

/** Fallen when the trunk centre is below this fraction of the standing height (common practice). */
export const FALL_HEIGHT_FRACTION = 0.4;

/**
 * Fallen when the trunk's up axis is tilted more than this from the ground normal (common
 * practice: beyond 60° a legged trunk cannot keep its feet under the hips and is not recoverable
 * by a stance controller).
 */
export const FALL_TILT_deg = 60;

/**
 * A wanted force counts as outside the cone only when it is outside by more than this (in
 * newtons). Common practice: a floating-point allowance, far below any physical force, so that a
 * controller clipping its forces exactly onto the true cone is not flagged by round-off.
 */
export const CONE_TOLERANCE_N = 1e-6;

/**
 * Per-sample friction margins are clamped to this floor. |f_t| = 2·μs·f_n (margin −1) is already
 * deep sliding; the floor keeps results finite on a frictionless patch (μs = 0) and bounds the
 * margin histogram's range.
 */
export const MARGIN_FLOOR = -1;

/** Friction-margin histogram bin width: p05 is exact to within half of it (0.0005). */
export const MARGIN_BIN_WIDTH = 0.001;

/**
 * A touchdown's transient lasts this long from the foot's first loaded physics step; the stance
 * margin is measured on the loaded samples after it (docs/scoring.md, Stance and touchdown). A
 * fixed time, not "until the foot sticks", so a foot that never stops sliding is still judged in
 * stance. 20 ms is 2.6 periods of the bundled feet's contact oscillation (7.7 ms, the foot mass
 * on the Hertz law at full weight, docs/scenarios.md): with restitution 0.5 per impact the bounce
 * has rung down to a few percent; and it is about a tenth of the shortest bundled stance
 * (0.6 × 0.32 s), so the stance margin still sees nine tenths of every stance.
 */
export const TOUCHDOWN_TRANSIENT_s = 0.02;

/** Loop-time histogram: log-spaced bins from LOOP_TIME_MIN_us to LOOP_TIME_MAX_us. */
export const LOOP_TIME_MIN_us = 0.1;
export const LOOP_TIME_MAX_us = 1e7;
/** Ratio between neighbouring loop-time bin edges: quantiles exact to within √1.01 − 1 ≈ 0.5 %. */
export const LOOP_TIME_BIN_RATIO = 1.01;

/** Below this commanded travel (over the whole scenario) progress is not defined (null). */
export const MIN_COMMANDED_TRAVEL_m = 0.01;

/** Legs are massless: the robot's mass is the trunk and the feet. */
export function totalMass_kg(robot: RobotParams): number {
  return robot.trunk.mass_kg + robot.hips_m.length * robot.foot.mass_kg;
}

/** The normal force above which a foot is loaded: fraction × total mass × |g|. */
export function loadedThreshold_N(robot: RobotParams, loadedFraction = DEFAULT_LOADED_FRACTION): number {
  return loadedFraction * totalMass_kg(robot) * STANDARD_GRAVITY_mps2;
}
