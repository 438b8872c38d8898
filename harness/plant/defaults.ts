// Plant defaults: the one place these numbers live. Scenario defaults import them.

/** Standard gravity (CGPM 1901; ISO 80000-3). */
export const STANDARD_GRAVITY_mps2 = 9.80665;

/**
 * Default physics step. Semi-implicit (leapfrog) integration of the feet is stable for ω·h < 2;
 * the stiffest default mode (a 0.25 kg foot on the default Hunt–Crossley contact under ~60 N load,
 * ω ≈ 300 rad/s) gives ω·h ≈ 0.15 at 0.5 ms. Convergence against half the step is in the tests.
 */
export const DEFAULT_PHYSICS_STEP_s = 0.0005;

/**
 * Hunt–Crossley law for a robot file without foot material data: k in N/m^1.5 (Hertzian exponent
 * 1.5), c in s/m (exact restitution 0.66 at 1 m/s, contactLaw.ts). Common practice for a soft
 * foot, from no material; robots that name their foot's radius and material get Hertz's law.
 */
export const DEFAULT_CONTACT = {
  stiffness_N_per_m: 2.0e5,
  exponent: 1.5,
  damping_s_per_m: 0.5,
} as const;

/** Default control loop: 1 kHz, budget = one control period. */
export const DEFAULT_CONTROL_RATE_Hz = 1000;
