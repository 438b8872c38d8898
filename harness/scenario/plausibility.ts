// Values that pass the schema but are probably unit slips: each gives a warning naming the field,
// the value and the likely mistake, never an error (a scenario may mean them).

import type { RobotParams } from '../plant/types.js';
import { list, num, rec, vec } from './guards.js';
import type { Finding } from '../files/issue.js';

const DEG_PER_RAD = 180 / Math.PI;

/**
 * Kinematic speed limit of a trot at the robot's own gait hints: during one stance (period ×
 * duty factor) a foot can sweep at most the chord its leg reaches at standing height,
 * 2·√(L_max² − h²), so the trunk cannot outrun chord ÷ stance time without changing the gait.
 */
export function reachSpeed_mps(robot: RobotParams): number | null {
  const h = robot.standingHeight_m;
  const L = robot.leg.maxLength_m;
  const stance_s = robot.gait.period_s * robot.gait.dutyFactor;
  if (!(L > h) || !(stance_s > 0)) return null;
  return (2 * Math.sqrt(L * L - h * h)) / stance_s;
}

export function checkPlausibility(data: Record<string, unknown>, robot: RobotParams | undefined): Finding[] {
  const warnings: Finding[] = [];
  const incline = rec(rec(data.ground)?.incline_deg);
  for (const axis of ['pitch', 'roll'] as const) {
    const value = num(incline?.[axis]);
    // A fraction of a degree written with decimals is what radians look like when typed as degrees.
    if (value !== undefined && value !== 0 && Math.abs(value) < 1 && !Number.isInteger(value)) {
      warnings.push({
        path: `/ground/incline_deg/${axis}`,
        message: `incline ${value}° is under one degree; if it was meant in radians it is ${(value * DEG_PER_RAD).toFixed(1)}° (incline_deg takes degrees)`,
      });
    }
  }
  const limit_mps = robot ? reachSpeed_mps(robot) : null;
  list(data.commands)?.forEach((c, i) => {
    const command = rec(c);
    const velocity = vec(command?.velocity_mps, 3);
    if (velocity && limit_mps !== null) {
      const speed = Math.hypot(velocity[0], velocity[1]);
      if (speed > limit_mps) {
        warnings.push({
          path: `/commands/${i}/velocity_mps`,
          message:
            `commanded speed ${speed.toFixed(2)} m/s is beyond this robot's reach at its gait (about ${limit_mps.toFixed(2)} m/s: ` +
            `leg chord ÷ stance time); is it in km/h (${(speed / 3.6).toFixed(2)} m/s) or a typo?`,
        });
      }
    }
    const yawRate = num(command?.yawRate_radps);
    // One turn per second is already fast for a legged robot; 2π rad/s and more reads like deg/s.
    if (yawRate !== undefined && Math.abs(yawRate) > 2 * Math.PI) {
      warnings.push({
        path: `/commands/${i}/yawRate_radps`,
        message: `yaw rate ${yawRate} rad/s is more than a turn per second; if it was meant in degrees per second it is ${(yawRate / DEG_PER_RAD).toFixed(3)} rad/s`,
      });
    }
  });
  return warnings;
}
