// Import settings when the map's `import` block leaves them out: the one place they are set.

import { DEFAULT_MATERIAL } from '../scenario/defaults.js';
import type { LogMap } from './map.js';

export interface ImportSettings {
  commandTolerance: { velocity_mps: number; yawRate_radps: number };
  forceNoise_N: number;
  speedNoise_mps: number;
  pushNoise_N: number;
  friction: {
    cell_m: number;
    origin_m: [number, number];
    minNormalForce_N: number;
    stickSpeed_mps: number;
    slideSpeed_mps: number;
    stribeckExponent: number;
  };
}

/**
 * Command changes below 0.02 m/s or 0.05 rad/s are joystick noise, not operator intent (common
 * practice). Sensor noise 0 unless stated: the bounds then trust every sample. A 1 m grid is a
 * floor-tile scale (common practice). Normal force below 20 N is a touch-down or lift-off, where
 * the ratio |f_t|/f_n is ill-conditioned (common practice). Stick below 5 mm/s, slide above 10 mm/s:
 * both well above the estimator noise of leg odometry (common practice); with stated speed noise σ
 * they are raised to 3σ and 5σ. The Stribeck exponent 2 is the plant's default material's.
 */
export function importSettings(map: LogMap): ImportSettings {
  const given = map.import ?? {};
  const speedNoise = given.speedNoise_mps ?? 0;
  const friction = given.friction ?? {};
  return {
    commandTolerance: { velocity_mps: given.commandTolerance?.velocity_mps ?? 0.02, yawRate_radps: given.commandTolerance?.yawRate_radps ?? 0.05 },
    forceNoise_N: given.forceNoise_N ?? 0,
    speedNoise_mps: speedNoise,
    pushNoise_N: given.pushNoise_N ?? 0,
    friction: {
      cell_m: friction.cell_m ?? 1,
      origin_m: friction.origin_m ?? [0, 0],
      minNormalForce_N: friction.minNormalForce_N ?? 20,
      stickSpeed_mps: friction.stickSpeed_mps ?? Math.max(0.005, 3 * speedNoise),
      slideSpeed_mps: friction.slideSpeed_mps ?? Math.max(0.01, 5 * speedNoise),
      stribeckExponent: friction.stribeckExponent ?? DEFAULT_MATERIAL.stribeckExponent,
    },
  };
}
