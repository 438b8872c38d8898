// What the controller is told, as the scenario's `sensing` block says: friction estimates derived
// from (never equal by reference to) the plant's truth, and seeded Gaussian noise on foot forces.

import type { Observation } from '../contract/tick.js';
import { SeededRandom } from '../plant/random.js';
import type { Sensing } from '../scenario/types.js';

export class SensorModel {
  private readonly random: SeededRandom;
  private readonly kind: 0 | 1 | 2;
  private readonly value: number;
  private readonly noise_N: number;

  constructor(sensing: Sensing, seed: number) {
    // A separate stream from any other use of the seed, so adding noise elsewhere changes nothing here.
    this.random = new SeededRandom((seed ^ 0x5e45e) >>> 0);
    const estimate = sensing.frictionEstimate;
    this.kind = estimate.kind === 'truth' ? 0 : estimate.kind === 'constant' ? 1 : 2;
    this.value = estimate.kind === 'constant' ? estimate.value : estimate.kind === 'scale' ? estimate.factor : 1;
    this.noise_N = sensing.forceNoise_N;
  }

  /** Fills obs.frictionEstimate from the true μs under each foot and perturbs obs.footForce_N. */
  apply(obs: Observation, trueStaticFriction: Float64Array): void {
    const n = obs.frictionEstimate.length;
    for (let i = 0; i < n; i++) {
      obs.frictionEstimate[i] = this.kind === 0 ? trueStaticFriction[i] : this.kind === 1 ? this.value : this.value * trueStaticFriction[i];
    }
    if (this.noise_N > 0) {
      const f = obs.footForce_N;
      for (let j = 0; j < f.length; j++) f[j] += this.noise_N * this.random.normal();
    }
  }
}
