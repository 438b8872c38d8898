// The contact law a scenario runs with: each field given under ground.contact wins; otherwise a
// robot whose foot names its radius and material gets Hertz's stiffness and the damping of its
// restitution (harness/plant/contactLaw.ts); otherwise the plant's default law.

import {
  dampingForRestitution_s_per_m,
  effectiveModulus_Pa,
  HERTZ_EXPONENT,
  hertzStiffness_N_per_m1p5,
  type Elastic,
} from '../plant/contactLaw.js';
import { DEFAULT_CONTACT } from '../plant/defaults.js';
import type { ContactLaw, RobotParams } from '../plant/types.js';

export interface ContactOverrides {
  stiffness_N_per_m?: number;
  exponent?: number;
  damping_s_per_m?: number;
}

export function resolveContactLaw(robot: RobotParams, given: ContactOverrides | undefined, floor: Elastic | undefined): ContactLaw {
  const foot = robot.foot;
  const material = foot.material;
  const derived: ContactLaw =
    material && foot.radius_m !== undefined
      ? {
          stiffness_N_per_m: hertzStiffness_N_per_m1p5(effectiveModulus_Pa(material, floor), foot.radius_m),
          exponent: HERTZ_EXPONENT,
          damping_s_per_m: dampingForRestitution_s_per_m(material.restitution, material.restitutionSpeed_mps),
        }
      : { ...DEFAULT_CONTACT };
  return {
    stiffness_N_per_m: given?.stiffness_N_per_m ?? derived.stiffness_N_per_m,
    exponent: given?.exponent ?? derived.exponent,
    damping_s_per_m: given?.damping_s_per_m ?? derived.damping_s_per_m,
  };
}
