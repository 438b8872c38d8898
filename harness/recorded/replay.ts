// `footing replay SCENARIO --build SPEC --out DIR`: runs a build on an imported scenario and
// compares the simulation with the recording the scenario names (fidelity.ts). Writes a results
// folder like `footing run` does (results.json with the run's `fidelity` block, report.html with
// recorded-vs-simulated overlays, junit.xml, summary.md) plus DIR/fidelity.json, all atomically,
// and prints the figures. Exit 0 the recording is reproduced within the tolerances, 1 it is not
// (or the run broke off), 2 bad input (nothing run).

import { readFileSync } from 'node:fs';
import path from 'node:path';
import { buildManifest } from '../builds/provenance.js';
import { BuildSpecError, parseBuildSpec } from '../builds/spec.js';
import { writeFileAtomicSync } from '../files/atomic.js';
import { writeOutputs } from '../commands/outputs.js';
import { createResultsFile } from '../results/runResult.js';
import { runOne } from '../run/runOne.js';
import { TOOL_VERSION } from '../version.js';
import { formatIssue } from '../files/issue.js';
import { loadScenarioFile } from '../scenario/load.js';
import { displayPath } from '../scenario/paths.js';
import { FidelityRecorder, type FidelityBlock } from '../score/fidelity.js';
import { parseTrajectory } from '../scenario/trajectory.js';

export interface ReplayOptions {
  scenario: string;
  build: string;
  out: string;
  cwd?: string;
}

export interface ReplayOutcome {
  exitCode: number;
  lines: string[];
  fidelity?: FidelityBlock;
}

export async function replayRecording(options: ReplayOptions): Promise<ReplayOutcome> {
  const cwd = options.cwd ?? process.cwd();
  const loaded = await loadScenarioFile(options.scenario, { cwd });
  if (!loaded.ok) return { exitCode: 2, lines: [...loaded.errors.map(formatIssue), 'footing replay: nothing was run'] };
  const scenario = loaded.scenarios[0];
  if (!scenario.recorded) return { exitCode: 2, lines: [`${displayPath(path.resolve(cwd, options.scenario), cwd)}: no recorded block (replay needs a scenario made by footing import)`, 'footing replay: nothing was run'] };
  let spec;
  try {
    spec = parseBuildSpec(options.build, cwd);
  } catch (e) {
    if (e instanceof BuildSpecError) return { exitCode: 2, lines: [e.message, 'footing replay: nothing was run'] };
    throw e;
  }
  const trajectoryFile = path.resolve(path.dirname(path.resolve(cwd, options.scenario)), scenario.recorded.trajectory);
  const recording = parseTrajectory(readFileSync(trajectoryFile, 'utf8'), displayPath(trajectoryFile, cwd));
  const recorder = new FidelityRecorder(recording);
  const halfTick_s = 0.5 / scenario.control.rate_Hz;
  const outDir = path.resolve(cwd, options.out);
  const startedAt = new Date().toISOString();
  const run = await runOne({ scenario, build: spec, outDir, trace: false }, [{ onTick: (s) => recorder.observe(s, halfTick_s) }]);
  const outcome = { error: run.error };
  const fidelity = recorder.finish();
  const manifest = await buildManifest(spec);
  const results = createResultsFile({ toolVersion: TOOL_VERSION, builds: [{ ...manifest, commit: manifest.git?.commit ?? null, dirty: manifest.git?.dirty ?? null }], startedAt, runs: [{ ...run, fidelity }] });
  writeOutputs(outDir, results);
  const file = path.join(outDir, 'fidelity.json');
  writeFileAtomicSync(file, JSON.stringify({ format: 'footing-fidelity', formatVersion: 1, scenario: { id: scenario.id, revision: scenario.revision, hash: scenario.hash }, build: spec.name, ...(outcome.error ? { error: outcome.error } : {}), fidelity }, null, 2) + '\n');
  const e = fidelity.trunkPositionError_m;
  const first = fidelity.firstExceeded;
  const s = fidelity.slips;
  const lines = [
    `footing replay: ${scenario.id} × ${spec.name}: ${fidelity.reproduces && !outcome.error ? 'reproduces the recording' : 'does not reproduce the recording'} within ${fidelity.tolerances.trunkPosition_m} m / ${fidelity.tolerances.trunkYaw_deg}°`,
    `  trunk path error: RMS ${(e.rms * 1000).toFixed(1)} mm, max ${(e.max * 1000).toFixed(1)} mm at ${e.maxAt_s.toFixed(3)} s; yaw error max ${fidelity.trunkYawError_deg.max.toFixed(2)}°`,
    `  first past tolerance: ${first ? `${first.time_s.toFixed(3)} s, ${first.quantity} (${first.error.toFixed(3)} > ${first.tolerance})` : 'never'}`,
    `  slips: ${s.recorded} recorded, ${s.reproduced} reproduced, ${s.missed} missed, ${s.extra} extra`,
    ...(outcome.error ? [`  the run broke off at ${(outcome.error.time_s ?? 0).toFixed(3)} s: ${outcome.error.message}`] : []),
    `  ${fidelity.note}`,
    `  → ${displayPath(file, cwd)}, results.json and report.html in ${displayPath(outDir, cwd)}`,
  ];
  return { exitCode: fidelity.reproduces && !outcome.error ? 0 : 1, lines, fidelity };
}
