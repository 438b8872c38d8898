// Linearised friction cones. A four-sided pyramid |f_x| ≤ μ'·f_z, |f_y| ≤ μ'·f_z with μ' = μ/√2 is
// inscribed in the Coulomb cone ‖f_t‖ ≤ μ·f_z (its corners touch the cone), so any force inside
// it is inside the cone (common practice in force-distribution QPs). The ground is z = 0 in the
// world frame, so the contact normal is the world z axis even on an incline (gravity tilts).

/** μ' of the inner pyramid: trust·μ_est·(1 − margin)/√2. */
export function innerPyramidCoefficient(frictionEstimate: number, trust: number, margin: number): number {
  return (trust * Math.max(0, frictionEstimate) * (1 - margin)) / Math.SQRT2;
}

/** μ' per foot into out; band = (trust, margin, …) as in the controller. */
export function innerPyramidCoefficients(out: Float64Array, estimates: Float64Array, band: Float64Array): Float64Array {
  const scale = (band[0] * (1 - band[1])) / Math.SQRT2;
  for (let i = 0; i < out.length; i++) out[i] = scale * (estimates[i] > 0 ? estimates[i] : 0);
  return out;
}

/**
 * The naive fix: clamp the normal force into [min, max], then clip each tangential component to
 * ±μ'·f_z (the Euclidean projection onto the pyramid at fixed normal force). pyramid: μ' per
 * leg; band = (trust, margin, f_min, f_max).
 */
export function clampIntoPyramid(forces: Float64Array, leg: number, pyramid: Float64Array, band: Float64Array): void {
  const o = 3 * leg, mu = pyramid[leg], min_N = band[2], max_N = band[3];
  let fz = forces[o + 2];
  if (fz < min_N) fz = min_N;
  if (fz > max_N) fz = max_N;
  const limit = mu * fz;
  const fx = forces[o], fy = forces[o + 1];
  forces[o] = fx > limit ? limit : fx < -limit ? -limit : fx;
  forces[o + 1] = fy > limit ? limit : fy < -limit ? -limit : fy;
  forces[o + 2] = fz;
}

/** ‖f_t‖/f_z of a force (Infinity when it does not press on the ground). */
export function frictionUse(forces: Float64Array, o: number): number {
  const fz = forces[o + 2];
  const ft = Math.hypot(forces[o], forces[o + 1]);
  return fz > 0 ? ft / fz : ft > 0 ? Infinity : 0;
}
