// The bench's threads of their own (harness/bench/ownThread.ts): from the TypeScript sources the
// thread registers the loader itself, and each task reports what the bench's table prints. Checks
// the figures' consistency with the scenario, never how fast anything is.

import { describe, expect, it } from 'vitest';
import { DEFAULT_BENCH_SCENARIO } from '../../harness/bench/defaults.js';
import { harnessOverheadInOwnThread_us, steadyClosedLoopInOwnThread } from '../../harness/bench/targets.js';
import { parseBuildSpec } from '../../harness/builds/spec.js';
import { loadScenarioFile } from '../../harness/scenario/load.js';

const BUDGET = { time_ms: 20, iterations: 2 };

async function shortScenario() {
  const loaded = await loadScenarioFile(DEFAULT_BENCH_SCENARIO);
  if (!loaded.ok) throw new Error(loaded.errors.map((e) => e.message).join('; '));
  // Stand, then the start of the trot: every foot path of the governed build runs.
  return { ...loaded.scenarios[0], duration_s: 1.3 };
}

describe('bench threads of their own', () => {
  it('measures the governed steady closed loop over the whole scenario, the factor from the median episode', async () => {
    const scenario = await shortScenario();
    const loop = await steadyClosedLoopInOwnThread(scenario, parseBuildSpec('ref:governed', process.cwd()), BUDGET);
    // The governed build holds the dry walk (docs/scenarios.md): the episode runs to its end.
    expect(loop.simulated_s).toBeCloseTo(1.3, 9);
    expect(loop.episode_ms).toBeGreaterThan(0);
    expect(loop.realTimeFactor).toBeCloseTo(loop.simulated_s / (loop.episode_ms / 1000), 9);
  });

  it('measures the harness overhead beside a positive plant cost', async () => {
    const figures = await harnessOverheadInOwnThread_us(await shortScenario(), BUDGET);
    expect(Number.isFinite(figures.overhead_us)).toBe(true);
    expect(figures.plant_us).toBeGreaterThan(0);
  });

  it('fails with the build\'s own error when the build cannot be opened, and names the task', async () => {
    const scenario = await shortScenario();
    await expect(steadyClosedLoopInOwnThread(scenario, parseBuildSpec('broken=./no/such/build.ts', process.cwd()), BUDGET)).rejects.toThrow(/no[/\\]such[/\\]build/);
  });
});
