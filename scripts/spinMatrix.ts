// The answer-spin table of docs/protocol.md ("Latency on idle machines"): a process build's
// protocol overhead (round trip − its reported compute) with the spin on neither side, the
// harness's only, the build's only, and both, in interleaved rounds.
//   npx tsx scripts/spinMatrix.ts 'stand-py=exec:python3 examples/python/stand_controller.py' [ticks] [rounds]
// Note the machine's load beside the figures (it prints the run queue and load average).

import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { createAction, createObservation } from '../harness/builds/interface.js';
import { openBuild } from '../harness/builds/loader.js';
import { PROCESS_BUILD_DEFAULTS, type ProcessBuild } from '../harness/builds/process/bridge.js';
import { parseBuildSpec } from '../harness/builds/spec.js';
import { controllerSetup } from '../harness/run/runOne.js';
import { loadScenarioFile } from '../harness/scenario/index.js';

const root = fileURLToPath(new URL('../', import.meta.url));
const [specText, ticksText = '20000', roundsText = '2'] = process.argv.slice(2);
if (specText === undefined) throw new Error('usage: spinMatrix.ts BUILD-SPEC [ticks] [rounds]');
const ticks = Number(ticksText);
const rounds = Number(roundsText);
const loaded = await loadScenarioFile(`${root}scenarios/dry-baseline-walk.yaml`);
if (!loaded.ok) throw new Error('scenarios/dry-baseline-walk.yaml does not load');
const scenario = loaded.scenarios[0];
const footCount = scenario.plant.robot.hips_m.length;
const window_us = PROCESS_BUILD_DEFAULTS.spin_us;
const cells = [
  { name: 'neither spins', harness_us: 0, build_us: 0 },
  { name: 'harness spins', harness_us: window_us, build_us: 0 },
  { name: 'build spins', harness_us: 0, build_us: window_us },
  { name: 'both spin', harness_us: window_us, build_us: window_us },
];

function machine(): string {
  // /proc/loadavg: three load averages, then running/total tasks.
  const [one, , , queue] = readFileSync('/proc/loadavg', 'utf8').split(' ');
  return `load ${one}, run queue ${queue.split('/')[0]}`;
}

for (let round = 1; round <= rounds; round++) {
  for (const cell of cells) {
    const build = await openBuild(parseBuildSpec(specText, root), controllerSetup(scenario), {
      spin_us: cell.harness_us,
      env: { FOOTING_SPIN_US: String(cell.build_us) },
    });
    // A standing observation: level trunk at the standing height, feet below the hips.
    const obs = createObservation(footCount);
    obs.trunkQuaternion[0] = 1;
    obs.trunkPosition_m[2] = scenario.plant.robot.standingHeight_m;
    scenario.plant.robot.hips_m.forEach((hip, i) => obs.footPosition_m.set([hip[0], hip[1], 0], 3 * i));
    const action = createAction(footCount, build.telemetryNames.length);
    const overhead_us = new Float64Array(ticks);
    const cpu = process.cpuUsage();
    const start_ms = performance.now();
    for (let k = 0; k < ticks; k++) {
      obs.time_s = k / scenario.control.rate_Hz;
      const pending = build.tick(obs, action);
      if (pending !== undefined) await pending;
      overhead_us[k] = build.loopTime_us - build.reportedCompute_us;
    }
    const wall_ms = performance.now() - start_ms;
    const used = process.cpuUsage(cpu);
    const spins = (build as ProcessBuild).spinStats;
    await build.close();
    overhead_us.sort();
    const p = (q: number) => overhead_us[Math.min(ticks - 1, Math.floor(q * ticks))].toFixed(1);
    const cpuShare = (used.user + used.system) / 1000 / wall_ms;
    console.log(
      `round ${round} ${cell.name.padEnd(14)} p50 ${p(0.5).padStart(6)} µs  p99 ${p(0.99).padStart(6)} µs  harness CPU ${(100 * cpuShare).toFixed(0)} %  spins ${spins.answered} answered, ${spins.missed} missed  ${machine()}`,
    );
  }
}
