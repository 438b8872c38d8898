// Physical checks on a scenario that the JSON Schema cannot express. They run on the migrated,
// expanded data even when the schema found problems, looking only at well-shaped values, so a
// file's errors all come out at once.

import { largestContactStep_s, STEPS_PER_CONTACT_PERIOD } from '../plant/contactLaw.js';
import { STANDARD_GRAVITY_mps2 } from '../plant/defaults.js';
import type { RobotParams } from '../plant/types.js';
import { resolveContactLaw } from './contact.js';
import { DEFAULT_MATERIAL, defaultControlRate_Hz, defaultLoopBudget_us, defaultPhysicsStep_s } from './defaults.js';
import { polygonProblem, type Point } from './geometry.js';
import { list, num, rec, vec } from './guards.js';
import { pointerJoin, type Finding } from '../files/issue.js';
import { runSizeProblems } from '../files/bounds.js';
import { checkPlausibility } from './plausibility.js';

export interface CheckResult {
  errors: Finding[];
  warnings: Finding[];
}

/** Tolerance for "whole number of physics steps per control period": far above rounding of 1/rate. */
const RATIO_TOLERANCE = 1e-6;
/** Time comparisons allow for decimal fractions such as 7.9 + 0.1 not summing exactly to 8. */
const TIME_TOLERANCE_s = 1e-9;

export function checkScenario(data: Record<string, unknown>, robot: RobotParams | undefined): CheckResult {
  const errors: Finding[] = [];
  const warnings: Finding[] = [];
  const given = num(data.duration_s);
  const duration = given !== undefined && given > 0 ? given : undefined; // else the schema reports it
  checkCommands(data, duration, errors, warnings);
  checkPushes(data, duration, robot, errors, warnings);
  checkGround(data, errors);
  checkTiming(data, errors, warnings);
  checkStart(data, errors);
  if (duration !== undefined) errors.push(...runSize(data, duration));
  if (robot) {
    checkInitial(data, robot, errors);
    checkContactStep(data, robot, errors);
  }
  warnings.push(...checkPlausibility(data, robot));
  return { errors, warnings };
}

function checkCommands(data: Record<string, unknown>, duration: number | undefined, errors: Finding[], warnings: Finding[]) {
  const commands = list(data.commands);
  if (!commands) return;
  let previous: number | undefined;
  commands.forEach((c, i) => {
    const command = rec(c);
    const at = num(command?.at_s);
    const path = `/commands/${i}/at_s`;
    if (at === undefined) return;
    if (i === 0 && at !== 0) {
      errors.push({ path, message: `the first command starts at ${at} s (expected the first command at_s: 0, so the controller has a command from the start)` });
    }
    if (previous !== undefined && !(at > previous)) {
      errors.push({ path, message: `command at ${at} s does not come after the previous one at ${previous} s (expected commands in strictly increasing at_s)` });
    }
    if (duration !== undefined && at >= duration) {
      errors.push({ path, message: `command at ${at} s starts at or after the end of the run (duration_s ${duration}; expected at_s < duration_s)` });
    }
    previous = at;
    const velocity = vec(command?.velocity_mps, 3);
    const yawRate = num(command?.yawRate_radps);
    if (command?.gait === 'stand' && ((velocity && velocity.some((v) => v !== 0)) || (yawRate !== undefined && yawRate !== 0))) {
      warnings.push({ path: `/commands/${i}`, message: 'a stand command asks for motion; standing controllers are expected to ignore it' });
    }
  });
}

function checkPushes(data: Record<string, unknown>, duration: number | undefined, robot: RobotParams | undefined, errors: Finding[], warnings: Finding[]) {
  const pushes = list(data.pushes);
  if (!pushes) return;
  pushes.forEach((p, i) => {
    const push = rec(p);
    if (!push) return;
    const at = num(push.at_s);
    const length = num(push.duration_s);
    if (!('series' in push) && at !== undefined && length !== undefined && duration !== undefined && at + length > duration + TIME_TOLERANCE_s) {
      errors.push({
        path: `/pushes/${i}`,
        message: `push from ${at} s to ${Number((at + length).toPrecision(12))} s ends after the run (duration_s ${duration}; expected at_s + duration_s ≤ ${duration})`,
      });
    }
    const point = vec(push.point_m, 3);
    if (point && robot) {
      const half = robot.trunk.halfExtents_m;
      if (point.some((x, k) => Math.abs(x) > half[k] + 1e-12)) {
        warnings.push({ path: `/pushes/${i}/point_m`, message: `push point [${point.join(', ')}] m lies outside the trunk box (half extents [${half.join(', ')}] m)` });
      }
    }
  });
}

function frictionPair(
  material: Record<string, unknown> | undefined,
  base: { staticFriction: number; kineticFriction: number },
  basePath: string,
  inheritedFrom: string,
  errors: Finding[],
) {
  const givenStatic = num(material?.staticFriction);
  const givenKinetic = num(material?.kineticFriction);
  const mu_s = givenStatic ?? base.staticFriction;
  const mu_k = givenKinetic ?? base.kineticFriction;
  // With neither value given here, the material it inherits from is already reported.
  if (!(mu_k <= mu_s) && (givenStatic !== undefined || givenKinetic !== undefined)) {
    const kText = givenKinetic === undefined ? `${mu_k} (inherited from ${inheritedFrom})` : `${mu_k}`;
    const sText = givenStatic === undefined ? `${mu_s} (inherited from ${inheritedFrom})` : `${mu_s}`;
    const path = pointerJoin(basePath, givenKinetic !== undefined ? 'kineticFriction' : 'staticFriction');
    errors.push({ path, message: `kinetic friction ${kText} exceeds static friction ${sText} (expected kineticFriction ≤ staticFriction)` });
  }
  return { staticFriction: mu_s, kineticFriction: mu_k };
}

function checkGround(data: Record<string, unknown>, errors: Finding[]) {
  const ground = rec(data.ground);
  if (!ground) return;
  const defaults = frictionPair(rec(ground.material), DEFAULT_MATERIAL, '/ground/material', 'the built-in dry floor', errors);
  list(ground.patches)?.forEach((p, i) => {
    const patch = rec(p);
    if (!patch) return;
    const base = `/ground/patches/${i}`;
    frictionPair(rec(patch.material), defaults, `${base}/material`, 'the default material', errors);
    if (rec(patch.material) && 'elastic' in rec(patch.material)!) {
      errors.push({ path: `${base}/material/elastic`, message: 'a patch cannot carry elastic data: one contact law holds for the whole ground (expected elastic under ground.material only)' });
    }
    const shapes = ['rect', 'circle', 'polygon_m'].filter((k) => k in patch);
    if (shapes.length !== 1) {
      errors.push({ path: base, message: `patch has ${shapes.length === 0 ? 'no shape' : `${shapes.length} shapes (${shapes.join(', ')})`} (expected exactly one of rect, circle, polygon_m)` });
    }
    const rect = rec(patch.rect);
    const lo = vec(rect?.min_m, 2);
    const hi = vec(rect?.max_m, 2);
    if (lo && hi) {
      ['x', 'y'].forEach((axis, k) => {
        if (!(lo[k] < hi[k])) {
          errors.push({ path: `${base}/rect/max_m/${k}`, message: `rect max_m ${axis} ${hi[k]} is not above min_m ${axis} ${lo[k]} (expected min_m < max_m in x and y)` });
        }
      });
    }
    const polygon = list(patch.polygon_m);
    if (polygon && polygon.length >= 3) {
      const vertices = polygon.map((v) => vec(v, 2));
      if (vertices.every((v) => v !== undefined)) {
        const problem = polygonProblem(vertices as unknown as Point[]);
        if (problem) errors.push({ path: `${base}/polygon_m/${problem.vertex}`, message: problem.message });
      }
    }
  });
  const raster = rec(ground.raster);
  if (raster) checkInlineRaster(raster, errors);
}

function checkInlineRaster(raster: Record<string, unknown>, errors: Finding[]) {
  const hasFile = 'file' in raster;
  const grids = ['staticFriction', 'kineticFriction'].filter((k) => k in raster);
  if (hasFile && grids.length > 0) {
    errors.push({ path: '/ground/raster', message: `raster gives both file and ${grids.join(' and ')} (expected either file: or the two grids inline)` });
    return;
  }
  if (hasFile) return;
  if (grids.length !== 2) {
    errors.push({ path: '/ground/raster', message: `raster gives ${grids.length === 0 ? 'no grid' : `only ${grids[0]}`} (expected both staticFriction and kineticFriction, or file:)` });
    return;
  }
  const shapes: Record<string, [number, number] | undefined> = {};
  for (const name of grids) {
    const rows = list(raster[name]);
    if (!rows || rows.length === 0 || !rows.every((r) => Array.isArray(r))) continue;
    const width = (rows[0] as unknown[]).length;
    let rectangular = true;
    rows.forEach((r, i) => {
      if ((r as unknown[]).length !== width) {
        rectangular = false;
        errors.push({ path: `/ground/raster/${name}/${i}`, message: `row ${i} has ${(r as unknown[]).length} cell${(r as unknown[]).length === 1 ? '' : 's'} but row 0 has ${width} (expected a rectangular grid)` });
      }
    });
    if (rectangular) shapes[name] = [rows.length, width];
  }
  const s = shapes.staticFriction;
  const k = shapes.kineticFriction;
  if (s && k) {
    if (s[0] !== k[0] || s[1] !== k[1]) {
      errors.push({ path: '/ground/raster/kineticFriction', message: `kineticFriction is ${k[0]}×${k[1]} but staticFriction is ${s[0]}×${s[1]} (expected the same shape)` });
      return;
    }
    const S = raster.staticFriction as unknown[][];
    const K = raster.kineticFriction as unknown[][];
    for (let i = 0; i < s[0]; i++) {
      for (let j = 0; j < s[1]; j++) {
        const ms = num(S[i][j]);
        const mk = num(K[i][j]);
        if (ms !== undefined && mk !== undefined && mk > ms) {
          errors.push({ path: `/ground/raster/kineticFriction/${i}/${j}`, message: `kinetic friction ${mk} exceeds static friction ${ms} in cell [${i}][${j}] (expected kineticFriction ≤ staticFriction)` });
        }
      }
    }
  }
}

function checkTiming(data: Record<string, unknown>, errors: Finding[], warnings: Finding[]) {
  const control = rec(data.control);
  const physics = rec(data.physics);
  const rate = num(control?.rate_Hz) ?? defaultControlRate_Hz();
  const step = num(physics?.step_s) ?? defaultPhysicsStep_s();
  if (rate <= 0 || step <= 0) return;
  // The episode loop runs a whole number of physics steps per control tick.
  const ratio = 1 / (rate * step);
  if (Math.abs(ratio - Math.round(ratio)) > RATIO_TOLERANCE * Math.max(1, ratio) || Math.round(ratio) < 1) {
    const path = physics && 'step_s' in physics ? '/physics/step_s' : control && 'rate_Hz' in control ? '/control/rate_Hz' : '/physics';
    errors.push({
      path,
      message: `the control period ${1000 / rate} ms is not a whole number of physics steps of ${step * 1000} ms (${Number(ratio.toPrecision(6))} steps; expected a whole number ≥ 1)`,
    });
  }
  const budget = num(control?.loopBudget_us);
  if (budget !== undefined && budget > defaultLoopBudget_us(rate) * (1 + 1e-12)) {
    warnings.push({ path: '/control/loopBudget_us', message: `loop budget ${budget} µs is longer than the control period ${defaultLoopBudget_us(rate)} µs` });
  }
}

function checkInitial(data: Record<string, unknown>, robot: RobotParams, errors: Finding[]) {
  const initial = rec(data.initial) ?? {};
  const position = vec(initial.position_m, 3) ?? [0, 0, robot.standingHeight_m];
  if (position[2] <= 0) {
    errors.push({ path: '/initial/position_m/2', message: `trunk height ${position[2]} m is not above the ground (expected position_m z > 0)` });
  }
  const feet = initial.feet;
  if (Array.isArray(feet)) {
    if (feet.length !== robot.hips_m.length) {
      errors.push({ path: '/initial/feet', message: `gives ${feet.length} foot positions but robot ${robot.id} has ${robot.hips_m.length} feet` });
    }
    feet.forEach((f, i) => {
      const foot = vec(f, 3);
      if (foot && foot[2] < 0) errors.push({ path: `/initial/feet/${i}/2`, message: `foot ${i} starts ${-foot[2]} m below the ground (expected z ≥ 0)` });
    });
    return;
  }
  if (feet !== undefined && feet !== 'standing') return;
  // Standing feet are under the hips on the ground, so each leg spans the hip's world height.
  // Roll–pitch–yaw is taken as the usual Z–Y–X sequence; the height of a hip is yaw-independent.
  const rpy = vec(initial.rpy_deg, 3) ?? [0, 0, 0];
  const roll = (rpy[0] * Math.PI) / 180;
  const pitch = (rpy[1] * Math.PI) / 180;
  robot.hips_m.forEach((hip, i) => {
    const z = position[2] - Math.sin(pitch) * hip[0] + Math.cos(pitch) * Math.sin(roll) * hip[1] + Math.cos(pitch) * Math.cos(roll) * hip[2];
    if (z < robot.leg.minLength_m - 1e-9 || z > robot.leg.maxLength_m + 1e-9) {
      errors.push({
        path: '/initial/position_m/2',
        message: `with feet standing, hip ${i} is ${Number(z.toFixed(6))} m above the ground, outside the leg range [${robot.leg.minLength_m}, ${robot.leg.maxLength_m}] m of robot ${robot.id}`,
      });
    }
  });
}

function runSize(data: Record<string, unknown>, duration_s: number): Finding[] {
  const control = rec(data.control);
  const physics = rec(data.physics);
  const rate = num(control?.rate_Hz) ?? defaultControlRate_Hz();
  const step = num(physics?.step_s) ?? defaultPhysicsStep_s();
  if (!(rate > 0 && step > 0)) return []; // the schema reports it
  return runSizeProblems(duration_s, rate, step, { rate: control && 'rate_Hz' in control ? '/control/rate_Hz' : 'the default control rate', step: physics && 'step_s' in physics ? '/physics/step_s' : '/duration_s' });
}

function checkStart(data: Record<string, unknown>, errors: Finding[]) {
  const initial = rec(data.initial);
  if (!initial || initial.start !== 'settled') return;
  if (Array.isArray(initial.feet)) {
    errors.push({ path: '/initial/start', message: 'a settled start places the feet itself, under the hips (expected feet: standing, or start: released with explicit foot positions)' });
  }
  for (const key of ['velocity_mps', 'angularVelocity_radps']) {
    const v = vec(initial[key], 3);
    if (v && v.some((x) => x !== 0)) {
      errors.push({ path: `/initial/${key}`, message: `a settled start is at rest, but ${key} is [${v.join(', ')}] (expected zero, or start: released for a moving start)` });
    }
  }
}

/**
 * The physics step must resolve the foot contact: at most 1/STEPS_PER_CONTACT_PERIOD of the
 * contact period at the whole robot's weight on one foot (harness/plant/contactLaw.ts).
 */
function checkContactStep(data: Record<string, unknown>, robot: RobotParams, errors: Finding[]) {
  const physics = rec(data.physics);
  const ground = rec(data.ground);
  const step = num(physics?.step_s) ?? defaultPhysicsStep_s();
  if (!(step > 0)) return;
  const given = rec(ground?.contact);
  const elastic = rec(rec(ground?.material)?.elastic);
  const overrides = {
    stiffness_N_per_m: num(given?.stiffness_N_per_m),
    exponent: num(given?.exponent),
    damping_s_per_m: num(given?.damping_s_per_m),
  };
  const floor = elastic && num(elastic.elasticModulus_Pa)! > 0 && num(elastic.poissonRatio) !== undefined
    ? { elasticModulus_Pa: num(elastic.elasticModulus_Pa)!, poissonRatio: num(elastic.poissonRatio)! }
    : undefined;
  const law = resolveContactLaw(robot, overrides, floor);
  if (!(law.stiffness_N_per_m > 0) || !(law.exponent >= 1)) return; // the schema reports these
  const weight_N = (robot.trunk.mass_kg + robot.hips_m.length * robot.foot.mass_kg) * STANDARD_GRAVITY_mps2;
  const largest = largestContactStep_s(law.stiffness_N_per_m, law.exponent, robot.foot.mass_kg, weight_N);
  if (step > largest * (1 + 1e-9)) {
    const period_ms = largest * STEPS_PER_CONTACT_PERIOD * 1000;
    errors.push({
      path: physics && 'step_s' in physics ? '/physics/step_s' : given ? '/ground/contact' : '/physics',
      message: `the physics step ${step * 1000} ms cannot resolve the foot contact (k = ${law.stiffness_N_per_m.toExponential(3)} N/m^${law.exponent}, contact period ${Number(period_ms.toPrecision(3))} ms at the robot's weight on one foot); it needs a step ≤ ${Number((largest * 1000).toPrecision(3))} ms (${STEPS_PER_CONTACT_PERIOD} steps per contact period)`,
    });
  }
}
