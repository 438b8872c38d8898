// The landing substep rule: a physics step in which a foot touches down is cut into K substeps so
// that the impact's first step — where the normal force builds from zero to hundreds of newtons
// and friction decides how far the foot slides — is resolved on the impact's own time scale.
// Pure functions: the factor is computed once per plant, K once per landing step.
//
// Duration of an impact on the law f = k·δⁿ (elastic part): a mass m arriving at speed v compresses
// to δmax with ½·m·v² = k·δmax^(n+1)/(n+1) (energy balance), and the contact lasts
//   t_c = 2·(δmax/v)·∫₀¹ dx/√(1 − x^(n+1)),
// which for Hertz (n = 3/2) is 2.94·δmax/v (Johnson, Contact Mechanics, 1985, §11.4) and for a
// linear spring (n = 1) π·δmax/v = π·√(m/k), half the spring's period.

/** Each substep is at most this fraction of the impact duration (the brief's design figure). */
export const SUBSTEPS_PER_IMPACT = 512;
/** Cap on K: a landing step costs at most this many integrations (plus the discarded trial). */
export const MAX_LANDING_SUBSTEPS = 64;
/**
 * A step in which a foot in contact sees its elastic force grow by more than this factor is still
 * its landing (our choice: 2 covers a Hertz impact's first ≈ 1.7 steps, (1 + h/t)^1.5 > 2).
 */
export const LANDING_FORCE_RATIO = 2;
/**
 * A foot sliding faster than this that friction stops within a step has that step retaken at the
 * finest substep (plant.ts). Our choice: a whole step puts the stop at the step's start and so
 * drops up to v·h/2 of slide; at 2 mm/s and 0.5 ms that is 0.5 µm per stop, under 0.4 % of the
 * ~0.14 mm a bundled landing slides, so slower stops are left to the whole step.
 */
export const STOP_SPEED_mps = 0.002;
/**
 * A sliding foot whose slip speed friction changes by more than this fraction within a step has
 * that step retaken at the finest substep too (our choice; a quarter keeps a steady stance slide,
 * whose speed changes by a few percent per step, at whole steps).
 */
export const SLIDE_CHANGE_FRACTION = 0.25;

/**
 * 2·∫₀¹ (1 − x^(n+1))^(−1/2) dx, the factor of δmax/v in the impact duration. Substituting
 * x = 1 − u² removes the end-point singularity (the integrand tends to 2/√(n+1) as u → 0), and
 * composite Simpson on the smooth remainder is exact to ~1e-9 with 400 panels.
 */
export function impactDurationFactor(exponent: number): number {
  const p = exponent + 1;
  const f = (u: number): number => {
    if (u === 0) return 2 / Math.sqrt(p);
    const x = 1 - u * u;
    return (2 * u) / Math.sqrt(1 - Math.pow(x, p));
  };
  const panels = 400;
  const du = 1 / panels;
  let sum = f(0) + f(1);
  for (let k = 1; k < panels; k++) sum += (k % 2 === 1 ? 4 : 2) * f(k * du);
  return 2 * (sum * du) / 3;
}

/** δmax = ((n + 1)·m·v² / (2k))^(1/(n+1)): the elastic energy balance of a landing. */
export function maxCompression_m(stiffness: number, exponent: number, mass_kg: number, speed_mps: number): number {
  return Math.pow(((exponent + 1) * mass_kg * speed_mps * speed_mps) / (2 * stiffness), 1 / (exponent + 1));
}

/** t_c = factor·δmax/v; `factor` from impactDurationFactor(exponent). */
export function impactDuration_s(stiffness: number, exponent: number, factor: number, mass_kg: number, speed_mps: number): number {
  return (factor * maxCompression_m(stiffness, exponent, mass_kg, speed_mps)) / speed_mps;
}

/**
 * K: the smallest power of two with step/K ≤ t_c/SUBSTEPS_PER_IMPACT, capped at
 * MAX_LANDING_SUBSTEPS (and 1 for a step already that fine, or a non-positive duration).
 */
export function landingSubsteps(step_s: number, impactDuration_s: number): number {
  if (!(impactDuration_s > 0)) return MAX_LANDING_SUBSTEPS;
  const limit_s = impactDuration_s / SUBSTEPS_PER_IMPACT;
  let k = 1;
  while (k < MAX_LANDING_SUBSTEPS && step_s / k > limit_s) k *= 2;
  return k;
}
