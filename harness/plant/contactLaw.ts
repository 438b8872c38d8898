// Contact laws from material data: Hertz stiffness, Hunt–Crossley damping from a coefficient of
// restitution, and the step a contact needs. Pure functions, called when a scenario is resolved
// and checked (never in the physics step).
//
// The plant's normal law is f = k·δⁿ·(1 + χ·δ̇) with χ = (3/2)·c (contact.ts). For a mass m hitting
// the ground at speed v_in, m·u·du/dδ = −k·δⁿ·(1 + χ·u) (u = δ̇) separates:
//   (m/χ²)·[χu − ln(1 + χu)] = −k·δⁿ⁺¹/(n + 1) + const,
// so between touch-down (δ = 0, u = v_in) and lift-off (δ = 0, u = −v_out) the restitution
// e = v_out/v_in solves  x − ln(1 + x) = −e·x − ln(1 − e·x)  with x = χ·v_in,
// independent of m, k and n (gravity neglected over the short impact). This is the exact form of
// the Hunt–Crossley relation (Hunt & Crossley 1975; closed forms of this kind in Marhefka & Orin,
// IEEE Trans. SMC-A 29(6), 1999). For small x it gives e ≈ 1 − c·v, the rule often quoted, which
// is off by 0.1–0.4 at the walking impact speeds of 1–2 m/s with c of order 1 s/m.

/** Elastic data of a body in contact. */
export interface Elastic {
  elasticModulus_Pa: number;
  poissonRatio: number;
}

/**
 * Effective modulus of two elastic bodies, 1/E* = (1 − ν₁²)/E₁ + (1 − ν₂²)/E₂ (Johnson, Contact
 * Mechanics, 1985, §4.2). A floor without elastic data is rigid (its term vanishes).
 */
export function effectiveModulus_Pa(foot: Elastic, floor?: Elastic): number {
  let compliance = (1 - foot.poissonRatio ** 2) / foot.elasticModulus_Pa;
  if (floor) compliance += (1 - floor.poissonRatio ** 2) / floor.elasticModulus_Pa;
  return 1 / compliance;
}

/** Hertz sphere on a plane: f = (4/3)·E*·√R·δ^(3/2) (Johnson 1985, §4.2), so k = (4/3)·E*·√R. */
export function hertzStiffness_N_per_m1p5(effectiveModulus: number, radius_m: number): number {
  return (4 / 3) * effectiveModulus * Math.sqrt(radius_m);
}

export const HERTZ_EXPONENT = 1.5;

/** Lift-off side of the exact relation: y ∈ (−1, 0) with y − ln(1 + y) = x − ln(1 + x), x > 0. */
function reboundRoot(x: number): number {
  const target = x - Math.log1p(x);
  let lo = -1;
  let hi = 0;
  // y − ln(1 + y) falls monotonically from +∞ (y → −1) to 0 (y = 0): bisection to rounding.
  for (let k = 0; k < 200; k++) {
    const mid = 0.5 * (lo + hi);
    if (mid === lo || mid === hi) break;
    if (mid - Math.log1p(mid) > target) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/** Restitution of the plant's law with damping c (s/m) at impact speed v (m/s), exact. */
export function restitutionAt(damping_s_per_m: number, speed_mps: number): number {
  const x = 1.5 * damping_s_per_m * speed_mps;
  if (x < 1e-6) return 1 - damping_s_per_m * speed_mps; // series limit; avoids cancellation
  return -reboundRoot(x) / x;
}

/** The damping c (s/m) whose exact restitution at `speed_mps` is `restitution` (0 < e ≤ 1). */
export function dampingForRestitution_s_per_m(restitution: number, speed_mps: number): number {
  if (restitution >= 1) return 0;
  // e(x) falls monotonically from 1 (x → 0) to 0 (x → ∞): bracket, then bisect on x = 1.5·c·v.
  let lo = 0;
  let hi = 1;
  while (restitutionAt(hi / (1.5 * speed_mps), speed_mps) > restitution) hi *= 2;
  for (let k = 0; k < 200; k++) {
    const mid = 0.5 * (lo + hi);
    if (mid === lo || mid === hi) break;
    if (restitutionAt(mid / (1.5 * speed_mps), speed_mps) > restitution) lo = mid;
    else hi = mid;
  }
  return (0.5 * (lo + hi)) / (1.5 * speed_mps);
}

/**
 * Steps per contact period a scenario's physics step must give. The feet are integrated by the
 * leapfrog, whose numerical frequency obeys sin(ω̃h/2) = ωh/2, i.e. a relative frequency error of
 * (ωh)²/24 (Hairer, Lubich & Wanner, Geometric Numerical Integration, ch. I.1, Störmer–Verlet):
 * 10 steps per period (ωh = 0.63) keep it below 2 % and far from the stability limit ωh = 2.
 */
export const STEPS_PER_CONTACT_PERIOD = 10;

/**
 * Small-oscillation period of a foot of mass m on the contact k·δⁿ linearised at the depth that
 * carries `load_N`: k_lin = n·k·δⁿ⁻¹, T = 2π·√(m/k_lin).
 */
export function contactPeriod_s(stiffness: number, exponent: number, mass_kg: number, load_N: number): number {
  const depth = (load_N / stiffness) ** (1 / exponent);
  const linear = exponent * stiffness * depth ** (exponent - 1);
  return 2 * Math.PI * Math.sqrt(mass_kg / linear);
}

/**
 * The largest physics step that resolves a robot's foot contact: the contact period at the whole
 * robot's weight on one foot (the heaviest static load a foot carries; a landing in a gait comes
 * near it), divided by STEPS_PER_CONTACT_PERIOD.
 */
export function largestContactStep_s(stiffness: number, exponent: number, footMass_kg: number, robotWeight_N: number): number {
  return contactPeriod_s(stiffness, exponent, footMass_kg, robotWeight_N) / STEPS_PER_CONTACT_PERIOD;
}
