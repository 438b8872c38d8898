// The operator's logged commands → the scenario's piecewise-constant command list. A new segment
// starts where the gait changes or a component leaves the current segment's first value by more
// than the tolerance; each segment holds the mean of its samples (rounded to 1 mm/s, 1 mrad/s,
// the resolution the scenario file keeps). Without a logged gait, a segment stands when its
// velocity and yaw rate are within the tolerance of zero.

import type { CommandFile } from '../scenario/format.js';
import { GAIT_BY_CODE } from './layout.js';
import type { Trajectory } from '../scenario/trajectory.js';

const round3 = (x: number) => Math.round(x * 1000) / 1000 + 0;

export function commandTimeline(tr: Trajectory, tolerance: { velocity_mps: number; yawRate_radps: number }): CommandFile[] {
  const segments: { start: number; end: number }[] = [];
  let start = 0;
  const gaitOf = (k: number) => tr.commandGait[k];
  for (let k = 1; k < tr.count; k++) {
    const changed =
      gaitOf(k) !== gaitOf(start) ||
      Math.abs(tr.commandVelocity_mps[2 * k] - tr.commandVelocity_mps[2 * start]) > tolerance.velocity_mps ||
      Math.abs(tr.commandVelocity_mps[2 * k + 1] - tr.commandVelocity_mps[2 * start + 1]) > tolerance.velocity_mps ||
      Math.abs(tr.commandYawRate_radps[k] - tr.commandYawRate_radps[start]) > tolerance.yawRate_radps;
    if (changed) {
      segments.push({ start, end: k });
      start = k;
    }
  }
  segments.push({ start, end: tr.count });
  const commands: CommandFile[] = [];
  for (const { start: a, end: b } of segments) {
    let vx = 0;
    let vy = 0;
    let wz = 0;
    for (let k = a; k < b; k++) {
      vx += tr.commandVelocity_mps[2 * k];
      vy += tr.commandVelocity_mps[2 * k + 1];
      wz += tr.commandYawRate_radps[k];
    }
    const m = b - a;
    const velocity: [number, number, number] = [round3(vx / m), round3(vy / m), 0];
    const yawRate = round3(wz / m);
    const logged = gaitOf(a);
    const still = Math.hypot(velocity[0], velocity[1]) <= tolerance.velocity_mps && Math.abs(yawRate) <= tolerance.yawRate_radps;
    const gait = logged >= 0 ? GAIT_BY_CODE[logged] : still ? 'stand' : 'trot';
    // The first segment holds from the scenario's start, whenever the log's first sample came.
    const at_s = commands.length === 0 ? 0 : round6(tr.t_s[a]);
    const last = commands[commands.length - 1];
    if (last && last.gait === gait && last.velocity_mps![0] === velocity[0] && last.velocity_mps![1] === velocity[1] && last.yawRate_radps === yawRate) continue;
    commands.push({ at_s, gait, velocity_mps: velocity, yawRate_radps: yawRate });
  }
  return commands;
}

export const round6 = (x: number) => Math.round(x * 1e6) / 1e6 + 0;
