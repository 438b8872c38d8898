// Ground contact laws for a point foot. Scalar functions, no allocation: the plant calls them for
// every foot at every physics step.
//
// Friction is handled as a *local implicit solve per foot per step* (a time-stepping scheme in the
// spirit of Stewart & Trinkle 1996, reduced to one point and one step): first ask what tangential
// force would bring the foot's tangential velocity to zero by the end of this step, given every
// other force on it. If that force fits inside the friction the foot has at its current slip
// speed — the Stribeck curve, which is the static cone μs·f_n for a foot at rest — the foot sticks
// exactly (zero tangential velocity, so zero drift — no tanh/atan regularisation, whose small
// velocity scale would force microsecond steps or creep). Otherwise the foot slides and the force
// is the Stribeck curve at the current slip speed, opposing the predicted slip. So a sliding foot
// is stopped only by sliding friction: a foot landing at 0.3 m/s is not snapped to rest by the
// static cone in its first contact step (which made its slip depend on the physics step), it
// decelerates at μ(v)·f_n until that friction can stop it within a step. Why not a bristle (elasto-plastic) state: it adds a
// stiff internal mode per foot that limits the step, and its pre-sliding creep is exactly what a
// stiction test must not see; a light foot makes the implicit solve cheap and exact.

/** k·δⁿ for δ > 0 (the exponents 3/2 and 1 written out: Math.pow is the slow general case). */
export function elasticForce_N(stiffness: number, exponent: number, depth_m: number): number {
  return exponent === 1.5 ? stiffness * depth_m * Math.sqrt(depth_m) : exponent === 1 ? stiffness * depth_m : stiffness * Math.pow(depth_m, exponent);
}

/**
 * Hunt–Crossley normal force f_n = k·δⁿ·(1 + (3/2)·c·δ̇), δ = penetration, δ̇ its rate
 * (Hunt & Crossley, ASME J. Appl. Mech. 42, 1975). Clamped at ≥ 0: the ground never pulls.
 */
export function huntCrossleyNormal_N(
  stiffness: number,
  exponent: number,
  damping_s_per_m: number,
  depth_m: number,
  depthRate_mps: number,
): number {
  if (depth_m <= 0) return 0;
  const elastic = elasticForce_N(stiffness, exponent, depth_m);
  const force = elastic * (1 + 1.5 * damping_s_per_m * depthRate_mps);
  return force > 0 ? force : 0;
}

/**
 * The Hunt–Crossley normal force with the penetration rate read at the step's start, second
 * order: the leapfrog's velocity there is v(t) = v(t − h/2) + τ·a(t) with τ = h_prev/2 and a(t)
 * including this very force, and since f is linear in δ̇ the equation
 *   f = k·δⁿ·(1 − χ·(w + τ·(F_other + f)/m)),  χ = (3/2)·c,  w = v_z(t − h/2),
 * is solved in closed form (the mid-step velocity alone lags the rate by half a step: first
 * order). otherForce_N: every other vertical force on the foot (leg, weight). Clamped at ≥ 0.
 */
export function huntCrossleyNormalAtStart_N(
  stiffness: number,
  exponent: number,
  damping_s_per_m: number,
  depth_m: number,
  midVelocityZ_mps: number,
  otherForce_N: number,
  mass_kg: number,
  lag_s: number,
): number {
  if (depth_m <= 0) return 0;
  const elastic = elasticForce_N(stiffness, exponent, depth_m);
  const chi = 1.5 * damping_s_per_m;
  const force = (elastic * (1 - chi * (midVelocityZ_mps + (lag_s * otherForce_N) / mass_kg))) / (1 + (elastic * chi * lag_s) / mass_kg);
  return force > 0 ? force : 0;
}

/**
 * Stribeck friction magnitude |f_t| = [μk + (μs − μk)·exp(−(v/v_s)^α)]·f_n + b·v at slip speed
 * v ≥ 0 (Armstrong-Hélouvry, Dupont & Canudas de Wit, Automatica 30(7), 1994).
 */
export function stribeckFriction_N(
  staticFriction: number,
  kineticFriction: number,
  stribeckVelocity_mps: number,
  stribeckExponent: number,
  viscous_Ns_per_m: number,
  speed_mps: number,
  normal_N: number,
): number {
  const ratio = speed_mps / stribeckVelocity_mps;
  const shaped =
    stribeckExponent === 2
      ? ratio * ratio
      : stribeckExponent === 1
        ? ratio
        : Math.pow(ratio, stribeckExponent);
  const mu = kineticFriction + (staticFriction - kineticFriction) * Math.exp(-shaped);
  return mu * normal_N + viscous_Ns_per_m * speed_mps;
}

/**
 * Tangential friction force on a foot for one step of length kick_s, written into out[0..1].
 * vx, vy: the foot's tangential velocity the kick starts from (the leapfrog's mid-step one);
 * fx, fy: every other tangential force on the foot this step (leg, gravity component);
 * slipSpeed_mps: the foot's tangential speed at the step's start, which the Stribeck curve reads.
 * Returns 1 when the foot sticks, 0 when it slides.
 */
export function footFriction(
  out: Float64Array,
  mass_kg: number,
  kick_s: number,
  vx: number,
  vy: number,
  fx: number,
  fy: number,
  normal_N: number,
  staticFriction: number,
  kineticFriction: number,
  stribeckVelocity_mps: number,
  stribeckExponent: number,
  viscous_Ns_per_m: number,
  slipSpeed_mps: number,
): number {
  // Force that zeroes the tangential velocity at the end of the step.
  const stickX = -(mass_kg * vx) / kick_s - fx;
  const stickY = -(mass_kg * vy) / kick_s - fy;
  const stickMagnitude = Math.sqrt(stickX * stickX + stickY * stickY);
  const magnitude = stribeckFriction_N(
    staticFriction,
    kineticFriction,
    stribeckVelocity_mps,
    stribeckExponent,
    viscous_Ns_per_m,
    slipSpeed_mps,
    normal_N,
  );
  // The friction available at this slip speed can stop the foot within the step: it sticks.
  if (stickMagnitude <= magnitude) {
    out[0] = stickX;
    out[1] = stickY;
    return 1;
  }
  // Friction opposes the predicted slip.
  const scale = magnitude / stickMagnitude;
  out[0] = stickX * scale;
  out[1] = stickY * scale;
  return 0;
}
