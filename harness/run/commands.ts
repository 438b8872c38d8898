// The operator's command schedule: which command holds at time t, and the commanded trunk path
// (the integral of the commanded velocity, rotated by the commanded yaw) the scorer tracks against.

import type { Observation } from '../contract/tick.js';
import type { CommandStep } from '../scenario/types.js';

export class CommandSchedule {
  private cursor = 0;
  /** Commanded heading, integrated from the yaw rate (world frame), starting at the initial yaw. */
  private yaw_rad: number;
  /** cos and sin of the heading they were taken at (recomputed only when the heading turns). */
  private trigYaw_rad = Number.NaN;
  private cosYaw = 1;
  private sinYaw = 0;

  constructor(
    private readonly steps: CommandStep[],
    initialYaw_rad = 0,
    /** The control period: the reference moves by one per advance(). */
    private readonly dt_s = 0,
  ) {
    this.yaw_rad = initialYaw_rad;
  }

  /**
   * Advances to the observation's time t: writes the command in force into obs.command and moves
   * the reference position by dt along the commanded velocity. The time comes in the observation,
   * not as an argument: a double passed to a call V8 does not inline is a heap number per tick. Velocities are in the world frame when the yaw
   * and heading are zero; the commanded velocity is given in the commanded heading frame and turns with it.
   */
  advance(obs: Observation, reference_m: Float64Array): void {
    const t_s = obs.time_s;
    const dt_s = this.dt_s;
    const command = obs.command;
    const steps = this.steps;
    while (this.cursor + 1 < steps.length && steps[this.cursor + 1].at_s <= t_s) this.cursor++;
    const step = steps.length > 0 && steps[this.cursor].at_s <= t_s ? steps[this.cursor] : null;
    if (!step) {
      command.gait = 'stand';
      command.velocity_mps[0] = 0;
      command.velocity_mps[1] = 0;
      command.velocity_mps[2] = 0;
      command.yawRate_radps = 0;
      return;
    }
    command.gait = step.gait;
    if (this.yaw_rad !== this.trigYaw_rad) {
      this.trigYaw_rad = this.yaw_rad;
      this.cosYaw = Math.cos(this.yaw_rad);
      this.sinYaw = Math.sin(this.yaw_rad);
    }
    const c = this.cosYaw;
    const s = this.sinYaw;
    const vx = step.velocity_mps[0];
    const vy = step.velocity_mps[1];
    command.velocity_mps[0] = c * vx - s * vy;
    command.velocity_mps[1] = s * vx + c * vy;
    command.velocity_mps[2] = step.velocity_mps[2];
    command.yawRate_radps = step.yawRate_radps;
    reference_m[0] += dt_s * command.velocity_mps[0];
    reference_m[1] += dt_s * command.velocity_mps[1];
    this.yaw_rad += dt_s * step.yawRate_radps;
  }
}
