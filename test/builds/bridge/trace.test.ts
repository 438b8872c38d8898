// End to end through the lead's episode loop and plant: the Python stand controller as a process
// build and the TypeScript one as an in-process build produce the same trace on a bundled
// scenario — the protocol adds no error. Skipped in a checkout without the episode loop.

import { existsSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import type { Action } from '../../../harness/builds/interface.js';
import { openBuild } from '../../../harness/builds/loader.js';
import { parseBuildSpec } from '../../../harness/builds/spec.js';
import type { TickSample } from '../../../harness/score/sample.js';
import { REPO_ROOT } from './helpers.js';

const EPISODE = `${REPO_ROOT}harness/run/episode.ts`;
const SCENARIO = `${REPO_ROOT}scenarios/dry-baseline-walk.yaml`;
const haveLoop = existsSync(EPISODE) && existsSync(SCENARIO) && existsSync(`${REPO_ROOT}harness/run/runOne.ts`);

interface Trace {
  trunk: number[];
  force: number[];
  ticks: number;
}

async function traceOf(specText: string): Promise<{ trace: Trace; error: unknown; standingHeight_m: number }> {
  const { runEpisode } = await import(/* @vite-ignore */ EPISODE);
  const { controllerSetup } = await import(/* @vite-ignore */ `${REPO_ROOT}harness/run/runOne.ts`);
  const { loadScenarioFile } = await import(/* @vite-ignore */ `${REPO_ROOT}harness/scenario/index.ts`);
  const loaded = await loadScenarioFile(SCENARIO);
  if (!loaded.ok) throw new Error(`cannot load ${SCENARIO}: ${JSON.stringify(loaded.errors)}`);
  // 0.4 s of standing: long enough for the height and attitude loops to act (several ms each).
  const scenario = { ...loaded.scenarios[0], duration_s: 0.4 };
  const build = await openBuild(parseBuildSpec(specText, REPO_ROOT), controllerSetup(scenario));
  const trace: Trace = { trunk: [], force: [], ticks: 0 };
  try {
    const outcome = await runEpisode(scenario, build, {
      observers: [
        {
          onTick(sample: TickSample, action: Action) {
            trace.trunk.push(...sample.trunkPosition_m, ...sample.trunkQuaternion);
            trace.force.push(...action.groundForce_N);
            trace.ticks++;
          },
        },
      ],
    });
    return { trace, error: outcome.error, standingHeight_m: scenario.plant.robot.standingHeight_m };
  } finally {
    await build.close();
  }
}

describe.skipIf(!haveLoop)('process build and in-process build through the episode loop', () => {
  it.each(['json', 'f64'])('give the same trace for the same controller logic (%s encoding)', async (encoding) => {
    const python = await traceOf(`stand-py=exec:python3 examples/python/stand_controller.py ?encoding=${encoding}`);
    const module = await traceOf('stand-ts=examples/typescript/stand_controller.ts');
    expect(python.error).toBeUndefined();
    expect(module.error).toBeUndefined();
    expect(python.trace.ticks).toBeGreaterThan(100);
    expect(python.trace.ticks).toBe(module.trace.ticks);
    // The example holds its posture: weight fed forward plus a 3 Hz height PD keeps the trunk
    // within a few millimetres of the robot's standing height (measured: < 1 mm; 5 mm allows for
    // contact compliance — our own bound, not a published one).
    const height_m = module.trace.trunk.filter((_, i) => i % 7 === 2);
    for (const z of height_m) expect(Math.abs(z - module.standingHeight_m)).toBeLessThan(0.005);
    let worst = 0;
    for (let i = 0; i < module.trace.force.length; i++) {
      worst = Math.max(worst, Math.abs(python.trace.force[i] - module.trace.force[i]) / Math.max(1, Math.abs(module.trace.force[i])));
    }
    for (let i = 0; i < module.trace.trunk.length; i++) {
      worst = Math.max(worst, Math.abs(python.trace.trunk[i] - module.trace.trunk[i]));
    }
    // The bound; in practice the traces are bit-identical (same operations, exact wire).
    expect(worst).toBeLessThanOrEqual(1e-12);
  });
});
