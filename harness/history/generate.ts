// Generated nights for the store's bench and tests — invented data, not measurements: S scenarios
// × B builds per night, every metric field filled, values a fixed level per (scenario, build)
// plus seeded normal noise, and optionally one planted step (a change point whose night is known).

import { SeededRandom } from '../plant/random.js';
import { RESULTS_FORMAT, RESULTS_FORMAT_VERSION, type ResultsFile, type RunResult } from '../results/types.js';
import type { ScoreMetrics } from '../score/types.js';

export interface PlantedStep {
  scenario: number;
  build: number;
  /** Night index of the first changed night. */
  fromNight: number;
  /** Added to frictionMargin.min (and p05) from that night on. */
  marginShift: number;
}

export interface GenerateOptions {
  nights: number;
  scenarios: number;
  builds: number;
  seed?: number;
  /** Standard deviation of the friction margin noise (default 0.01). */
  marginNoise?: number;
  step?: PlantedStep;
  /** ISO date of night 0 (default 2031-01-01). */
  firstNight?: string;
}

const DAY_ms = 86_400_000;
const hex = (n: number, width: number) => n.toString(16).padStart(width, '0').slice(-width);

export function scenarioId(k: number): string {
  return `generated-${String(k).padStart(3, '0')}`;
}

/** Night `night` of the generated history (each night is built on demand: 365 × 600 runs do not sit in memory at once). */
export function generateNight(options: GenerateOptions, night: number): ResultsFile {
  const random = new SeededRandom((options.seed ?? 1) * 1_000_003 + night);
  const noise = options.marginNoise ?? 0.01;
  const start = Date.parse(options.firstNight ?? '2031-01-01T02:00:00.000Z') + night * DAY_ms;
  const commit = hex(0x5eed0000 + night * 7919, 8).repeat(5);
  const builds = Array.from({ length: options.builds }, (_, b) => ({ name: `build-${b}`, kind: 'module', entry: `builds/${b}.js`, commit, dirty: false }));
  const runs: RunResult[] = [];
  for (let s = 0; s < options.scenarios; s++) {
    for (let b = 0; b < options.builds; b++) {
      const stepped = options.step && options.step.scenario === s && options.step.build === b && night >= options.step.fromNight ? options.step.marginShift : 0;
      const level = 0.35 + 0.01 * ((s * 7 + b * 3) % 10);
      const min = level + stepped + noise * random.normal();
      const slip = Math.abs(0.004 + 0.001 * random.normal());
      const metrics: ScoreMetrics = {
        ticks: 2000,
        loadedThreshold_N: 5,
        slipSpeed_mps: 0.01,
        frictionMargin: { min, p05: min + 0.05 + 0.005 * random.normal(), loadedSamples: 8000, perFoot: [] },
        // The gate judges the stance margin; generated nights carry the same figures there.
        stanceMargin: { min, p05: min + 0.05, loadedSamples: 7600, perFoot: [] },
        violations: { commanded: 0, commandedTime_s: 0, slip: Math.round(Math.abs(random.normal())), slipTime_s: 0.01 * Math.abs(random.normal()), perFoot: [] },
        slipDistance_m: slip,
        slipDistancePerFoot_m: [],
        fell: false,
        fellAt_s: null,
        fallReason: null,
        trackingRms_m: Math.abs(0.02 + 0.002 * random.normal()),
        commandedTravel_m: 2,
        progress: 0.95 + 0.01 * random.normal(),
        loopTime_us: { p50: 6 + 0.3 * random.normal(), p99: 9 + 0.5 * random.normal(), max: 20 + 2 * random.normal(), budget: 1000, overruns: 0 },
      };
      runs.push({
        scenario: { id: scenarioId(s), revision: 1, hash: hex(s * 2654435761, 8).repeat(8), file: `scenarios/${scenarioId(s)}.yaml`, title: `Generated scenario ${s} (invented)` },
        build: `build-${b}`,
        status: min >= 0.2 ? 'pass' : 'fail',
        reasons: min >= 0.2 ? [] : [`friction margin min ${min.toFixed(3)} below 0.2`],
        sim: { duration_s: 10, wall_s: 0.1 + 0.01 * Math.abs(random.normal()), realTimeFactor: 90, physicsStep_s: 0.0005, controlRate_Hz: 200, totalMass_kg: 24 },
        metrics,
      });
    }
  }
  return {
    format: RESULTS_FORMAT,
    formatVersion: RESULTS_FORMAT_VERSION,
    toolVersion: '0.1.0',
    startedAt: new Date(start).toISOString(),
    machine: { cores: 2, nodeVersion: 'v20.0.0', platform: 'linux', arch: 'x64', cpuModel: 'generated' },
    builds,
    runs,
  };
}
