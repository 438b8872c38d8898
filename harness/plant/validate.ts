// Physical sanity of a PlantConfig, checked when a plant is built. The scenario loader checks the
// same things with file positions; this is the last line of defence for configs built in code.

import { PlantConfigError } from './errors.js';
import type { Material, PlantConfig } from './types.js';

export function validatePlantConfig(config: PlantConfig): void {
  assertAllFinite(config, 'config');
  const { robot, ground, physics } = config;
  positive('robot.trunk.mass_kg', robot.trunk.mass_kg);
  positive('robot.foot.mass_kg', robot.foot.mass_kg);
  if (robot.hips_m.length < 1) {
    throw new PlantConfigError('robot.hips_m', robot.hips_m.length, 'at least one hip (one foot per hip)');
  }
  symmetricPositiveDefinite('robot.trunk.inertia_kgm2', robot.trunk.inertia_kgm2);
  robot.trunk.halfExtents_m.forEach((v, i) => positive(`robot.trunk.halfExtents_m[${i}]`, v));
  nonNegative('robot.leg.minLength_m', robot.leg.minLength_m);
  if (!(robot.leg.maxLength_m > robot.leg.minLength_m)) {
    throw new PlantConfigError('robot.leg.maxLength_m', robot.leg.maxLength_m, `> leg.minLength_m (${robot.leg.minLength_m})`);
  }
  positive('robot.leg.maxForce_N', robot.leg.maxForce_N);
  nonNegative('robot.leg.endStopStiffness_N_per_m', robot.leg.endStopStiffness_N_per_m);
  nonNegative('robot.leg.endStopDamping_Ns_per_m', robot.leg.endStopDamping_Ns_per_m);
  positive('robot.standingHeight_m', robot.standingHeight_m);

  positive('ground.contact.stiffness_N_per_m', ground.contact.stiffness_N_per_m);
  if (!(ground.contact.exponent >= 1)) {
    throw new PlantConfigError('ground.contact.exponent', ground.contact.exponent, '≥ 1 (1 linear, 1.5 Hertzian)');
  }
  nonNegative('ground.contact.damping_s_per_m', ground.contact.damping_s_per_m);
  for (const [axis, angle] of Object.entries(ground.incline_deg)) {
    if (!(Math.abs(angle) < 90)) {
      throw new PlantConfigError(`ground.incline_deg.${axis}`, angle, 'an angle strictly between −90 and 90 degrees');
    }
  }
  material('ground.friction.default', ground.friction.default);
  ground.friction.patches.forEach((patch, i) => {
    material(`ground.friction.patches[${i}].material`, patch.material);
    if (patch.shape.kind === 'circle') positive(`ground.friction.patches[${i}].radius_m`, patch.shape.radius_m);
    if (patch.shape.kind === 'polygon' && patch.shape.vertices_m.length < 3) {
      throw new PlantConfigError(`ground.friction.patches[${i}].vertices_m`, patch.shape.vertices_m.length, 'at least 3 vertices');
    }
  });
  const raster = ground.friction.raster;
  if (raster) {
    positive('ground.friction.raster.cell_m', raster.cell_m);
    const nx = raster.staticFriction.length;
    const ny = nx > 0 ? raster.staticFriction[0].length : 0;
    if (nx === 0 || ny === 0) throw new PlantConfigError('ground.friction.raster.staticFriction', '[]', 'a non-empty grid');
    if (raster.kineticFriction.length !== nx) {
      throw new PlantConfigError('ground.friction.raster.kineticFriction', raster.kineticFriction.length, `${nx} rows like staticFriction`);
    }
    for (let i = 0; i < nx; i++) {
      if (raster.staticFriction[i].length !== ny || raster.kineticFriction[i].length !== ny) {
        throw new PlantConfigError(`ground.friction.raster[${i}]`, raster.staticFriction[i].length, `${ny} cells in every row`);
      }
      for (let j = 0; j < ny; j++) {
        const mus = raster.staticFriction[i][j];
        const muk = raster.kineticFriction[i][j];
        nonNegative(`ground.friction.raster.staticFriction[${i}][${j}]`, mus);
        nonNegative(`ground.friction.raster.kineticFriction[${i}][${j}]`, muk);
        if (muk > mus) {
          throw new PlantConfigError(`ground.friction.raster.kineticFriction[${i}][${j}]`, muk, `≤ staticFriction (${mus})`);
        }
      }
    }
  }
  positive('physics.step_s', physics.step_s);
  config.pushes.forEach((push, i) => {
    if (push.kind === 'pulse') positive(`pushes[${i}].duration_s`, push.duration_s);
    else {
      if (push.t_s.length !== push.force_N.length || push.t_s.length < 2) {
        throw new PlantConfigError(`pushes[${i}].t_s`, push.t_s.length, 'at least 2 samples, one force per time');
      }
      for (let k = 1; k < push.t_s.length; k++) {
        if (!(push.t_s[k] > push.t_s[k - 1])) {
          throw new PlantConfigError(`pushes[${i}].t_s[${k}]`, push.t_s[k], `strictly greater than the previous time ${push.t_s[k - 1]}`);
        }
      }
    }
  });
  const initial = config.initial;
  if (initial.start !== 'settled' && initial.start !== 'released') {
    throw new PlantConfigError('initial.start', String(initial.start), "'settled' or 'released'");
  }
  if (initial.start === 'settled') {
    if (initial.feet !== 'standing') throw new PlantConfigError('initial.start', 'settled', "feet: 'standing' (explicit foot positions need start 'released')");
    const moving = [...initial.velocity_mps, ...initial.angularVelocity_radps].some((x) => x !== 0);
    if (moving) throw new PlantConfigError('initial.start', 'settled', "zero initial velocities (a settled start is at rest; use start 'released' for a moving start)");
  }
  if (config.initial.feet !== 'standing' && config.initial.feet.length !== robot.hips_m.length) {
    throw new PlantConfigError('initial.feet', config.initial.feet.length, `${robot.hips_m.length} foot positions, one per hip`);
  }
}

function material(path: string, m: Material): void {
  nonNegative(`${path}.staticFriction`, m.staticFriction);
  nonNegative(`${path}.kineticFriction`, m.kineticFriction);
  if (m.kineticFriction > m.staticFriction) {
    throw new PlantConfigError(`${path}.kineticFriction`, m.kineticFriction, `≤ staticFriction (${m.staticFriction})`);
  }
  positive(`${path}.stribeckVelocity_mps`, m.stribeckVelocity_mps);
  positive(`${path}.stribeckExponent`, m.stribeckExponent);
  nonNegative(`${path}.viscous_Ns_per_m`, m.viscous_Ns_per_m);
}

function positive(path: string, v: number): void {
  if (!(v > 0)) throw new PlantConfigError(path, v, 'a positive number');
}

function nonNegative(path: string, v: number): void {
  if (!(v >= 0)) throw new PlantConfigError(path, v, 'a number ≥ 0');
}

/** Sylvester's criterion on the leading minors, plus symmetry to a relative 1e-9. */
function symmetricPositiveDefinite(path: string, m: number[][]): void {
  if (m.length !== 3 || m.some((row) => row.length !== 3)) throw new PlantConfigError(path, m, 'a 3×3 matrix');
  const scale = Math.max(Math.abs(m[0][0]), Math.abs(m[1][1]), Math.abs(m[2][2]), 1e-300);
  for (let i = 0; i < 3; i++) {
    for (let j = i + 1; j < 3; j++) {
      if (Math.abs(m[i][j] - m[j][i]) > 1e-9 * scale) throw new PlantConfigError(`${path}[${i}][${j}]`, m[i][j], `equal to [${j}][${i}] (${m[j][i]}): inertia is symmetric`);
    }
  }
  const d1 = m[0][0];
  const d2 = m[0][0] * m[1][1] - m[0][1] * m[1][0];
  const d3 =
    m[0][0] * (m[1][1] * m[2][2] - m[1][2] * m[2][1]) -
    m[0][1] * (m[1][0] * m[2][2] - m[1][2] * m[2][0]) +
    m[0][2] * (m[1][0] * m[2][1] - m[1][1] * m[2][0]);
  if (!(d1 > 0 && d2 > 0 && d3 > 0)) throw new PlantConfigError(path, m, 'a positive-definite inertia (all leading minors > 0)');
}

function assertAllFinite(value: unknown, path: string): void {
  if (typeof value === 'number') {
    if (!Number.isFinite(value)) throw new PlantConfigError(path, value, 'a finite number');
  } else if (Array.isArray(value)) {
    value.forEach((v, i) => assertAllFinite(v, `${path}[${i}]`));
  } else if (value && typeof value === 'object') {
    for (const [k, v] of Object.entries(value)) assertAllFinite(v, path === 'config' ? k : `${path}.${k}`);
  }
}
