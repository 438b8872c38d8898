// Robot descriptions: the physical checks the schema cannot express, and loading a robot file.

import { STANDARD_GRAVITY_mps2 } from '../plant/defaults.js';
import type { RobotParams } from '../plant/types.js';
import { resolveRobot } from './defaults.js';
import type { RobotFile } from './format.js';
import { pointerJoin, type Finding } from '../files/issue.js';
import { list, num, rec, vec } from './guards.js';

/**
 * Eigenvalues of a symmetric 3×3 matrix, ascending, by the closed form of Smith (1961),
 * "Eigenvalues of a symmetric 3 × 3 matrix", Comm. ACM 4(4):168.
 */
export function symmetricEigenvalues3(m: readonly (readonly number[])[]): [number, number, number] {
  const p1 = m[0][1] ** 2 + m[0][2] ** 2 + m[1][2] ** 2;
  if (p1 === 0) {
    const d = [m[0][0], m[1][1], m[2][2]].sort((a, b) => a - b);
    return [d[0], d[1], d[2]];
  }
  const q = (m[0][0] + m[1][1] + m[2][2]) / 3;
  const p2 = (m[0][0] - q) ** 2 + (m[1][1] - q) ** 2 + (m[2][2] - q) ** 2 + 2 * p1;
  const p = Math.sqrt(p2 / 6);
  const b = [0, 1, 2].map((i) => [0, 1, 2].map((j) => (m[i][j] - (i === j ? q : 0)) / p));
  const detB =
    b[0][0] * (b[1][1] * b[2][2] - b[1][2] * b[2][1]) -
    b[0][1] * (b[1][0] * b[2][2] - b[1][2] * b[2][0]) +
    b[0][2] * (b[1][0] * b[2][1] - b[1][1] * b[2][0]);
  const r = Math.min(1, Math.max(-1, detB / 2));
  const phi = Math.acos(r) / 3;
  const largest = q + 2 * p * Math.cos(phi);
  const smallest = q + 2 * p * Math.cos(phi + (2 * Math.PI) / 3);
  const middle = 3 * q - largest - smallest;
  return [smallest, middle, largest];
}

/** Relative tolerance for symmetry and the triangle inequality: well above double rounding. */
const RELATIVE_TOLERANCE = 1e-9;

/** Physical checks of a robot description; `base` is '' for a robot file, '/robot' inline. */
export function checkRobot(data: unknown, base: string): Finding[] {
  const out: Finding[] = [];
  const robot = rec(data);
  if (!robot) return out;
  const trunk = rec(robot.trunk);
  const inertia = list(trunk?.inertia_kgm2);
  const rows = inertia && inertia.length === 3 ? inertia.map((r) => vec(r, 3)) : undefined;
  if (rows && rows.every((r) => r !== undefined)) {
    const I = rows as number[][];
    const ipath = pointerJoin(base, 'trunk', 'inertia_kgm2');
    const scale = Math.max(...I.flat().map(Math.abs));
    let symmetric = true;
    for (const [i, j] of [[0, 1], [0, 2], [1, 2]] as const) {
      if (Math.abs(I[i][j] - I[j][i]) > RELATIVE_TOLERANCE * scale) {
        symmetric = false;
        out.push({ path: pointerJoin(ipath, j, i), message: `inertia is not symmetric: I[${i}][${j}] = ${I[i][j]} but I[${j}][${i}] = ${I[j][i]} (expected equal products of inertia)` });
      }
    }
    if (symmetric) {
      // Sylvester's criterion: a symmetric matrix is positive definite iff its leading minors are.
      const m1 = I[0][0];
      const m2 = I[0][0] * I[1][1] - I[0][1] * I[1][0];
      const m3 =
        I[0][0] * (I[1][1] * I[2][2] - I[1][2] * I[2][1]) -
        I[0][1] * (I[1][0] * I[2][2] - I[1][2] * I[2][0]) +
        I[0][2] * (I[1][0] * I[2][1] - I[1][1] * I[2][0]);
      const minors = [m1, m2, m3];
      const bad = minors.findIndex((m) => !(m > 0));
      if (bad >= 0) {
        out.push({ path: ipath, message: `inertia is not positive definite (leading minor ${bad + 1} is ${Number(minors[bad].toPrecision(6))}; expected all leading minors > 0)` });
      } else {
        // Principal moments of any rigid body obey I1 + I2 ≥ I3 (each is a sum of two of the
        // three second moments of mass; e.g. Goldstein, Classical Mechanics, ch. 5).
        const [a, b, c] = symmetricEigenvalues3(I);
        if (a + b < c * (1 - 1e-6)) {
          out.push({
            path: ipath,
            message: `principal moments ${[a, b, c].map((x) => Number(x.toPrecision(4))).join(', ')} kg·m² violate the triangle inequality (no rigid body has them: expected the two smaller to sum to at least the largest)`,
          });
        }
      }
    }
  }
  const leg = rec(robot.leg);
  const minLength = num(leg?.minLength_m);
  const maxLength = num(leg?.maxLength_m);
  if (minLength !== undefined && maxLength !== undefined && !(minLength < maxLength)) {
    out.push({ path: pointerJoin(base, 'leg', 'maxLength_m'), message: `maxLength_m ${maxLength} is not above minLength_m ${minLength} (expected minLength_m < maxLength_m)` });
  }
  const height = num(robot.standingHeight_m);
  const hips = list(robot.hips_m);
  const legNames = list(robot.legNames);
  if (legNames && hips && legNames.length !== hips.length) {
    out.push({ path: pointerJoin(base, 'legNames'), message: `gives ${legNames.length} leg names for ${hips.length} hips (expected one name per entry of hips_m, in the same order)` });
  }
  if (height !== undefined && minLength !== undefined && maxLength !== undefined && minLength < maxLength && hips) {
    hips.forEach((h, i) => {
      const hip = vec(h, 3);
      if (!hip) return;
      const length = height + hip[2];
      if (length < minLength || length > maxLength) {
        out.push({
          path: pointerJoin(base, 'standingHeight_m'),
          message: `standing at ${height} m puts hip ${i} at ${Number(length.toFixed(6))} m above the ground, outside the leg range [${minLength}, ${maxLength}] m (expected standingHeight_m + hip z within the leg range)`,
        });
      }
    });
  }
  const trunkMass = num(trunk?.mass_kg);
  const footMass = num(rec(robot.foot)?.mass_kg);
  const maxForce = num(leg?.maxForce_N);
  if (trunkMass !== undefined && footMass !== undefined && maxForce !== undefined && hips && hips.length > 0) {
    // Standing needs the legs to carry the trunk's weight (the feet rest on the ground).
    const weight_N = trunkMass * STANDARD_GRAVITY_mps2;
    if (hips.length * maxForce < weight_N) {
      out.push({
        path: pointerJoin(base, 'leg', 'maxForce_N'),
        message: `${hips.length} legs of at most ${maxForce} N cannot carry the trunk's weight of ${weight_N.toFixed(1)} N (expected legs × maxForce_N ≥ trunk mass × g)`,
      });
    }
  }
  return out;
}

export function robotFromFile(file: RobotFile): RobotParams {
  return resolveRobot(file);
}
