// The imported scenario as files: <id>.yaml (a plain footing-scenario, version 1, with the
// identification's bounds as comments), <id>.trajectory.csv (hashed into the scenario), <id>.push.csv
// (the push series, when there is a push), <id>.friction.json (the identification in full) and a
// copy of the robot file under robots/. Only content that comes from the recording enters the
// YAML's fields; where it came from (log file, format) goes into comments and the description,
// which are not hashed — so a CSV and an MCAP copy of one log import to the same scenario hash.

import path from 'node:path';
import { DEFAULT_MATERIAL } from '../scenario/defaults.js';
import type { CommandFile } from '../scenario/format.js';
import { rollPitchYawFromQuaternion } from '../plant/rotation.js';
import type { RobotParams, Vec3 } from '../plant/types.js';
import type { FrictionIdentification, RegionEstimate } from './friction.js';
import type { PushEstimate } from './pushSeries.js';
import type { Trajectory } from '../scenario/trajectory.js';

export interface ScenarioDraft {
  id: string;
  title: string;
  revision: number;
  controlRate_Hz?: number;
  robot: RobotParams;
  robotFileName: string;
  trajectory: Trajectory;
  trajectoryFile: string;
  trajectorySha256: string;
  commands: CommandFile[];
  push: PushEstimate;
  pushFile: string;
  pushPoint_m: Vec3;
  friction: FrictionIdentification;
  /** Lines for the header comment and description: source log, map, format. */
  provenance: string[];
}

/** Trunk speed below which a first sample counts as standing still (common practice: 5 cm/s). */
const SETTLED_SPEED_mps = 0.05;

const r3 = (x: number) => Math.round(x * 1000) / 1000 + 0;
const r4 = (x: number) => Math.round(x * 1e4) / 1e4 + 0;
const list = (v: readonly number[]) => `[${v.join(', ')}]`;

/** Materials of one region: what the scenario's plant gets, and the comment that carries the bounds. */
export function regionMaterial(region: RegionEstimate): { staticFriction: number; kineticFriction: number; stribeckVelocity_mps: number; basis: string } {
  if (region.verdict === 'slid') {
    const s = region.staticFriction!;
    const k = region.kineticFriction!;
    const staticFriction = r3(s.estimate);
    return { staticFriction, kineticFriction: Math.min(staticFriction, r3(k.estimate)), stribeckVelocity_mps: region.stribeckVelocity_mps !== undefined ? r4(region.stribeckVelocity_mps) : DEFAULT_MATERIAL.stribeckVelocity_mps, basis: region.stribeckVelocity_mps !== undefined ? "fitted" : "fitted (v_s not seen: default)" };
  }
  // No slide seen: the floor held at least the lower bound. Use the default dry floor unless the
  // bound exceeds it, then the bound with the default's ratio μk/μs (docs/recorded.md).
  const bound = region.staticLowerBound ?? 0;
  if (bound <= DEFAULT_MATERIAL.staticFriction) {
    return { staticFriction: DEFAULT_MATERIAL.staticFriction, kineticFriction: DEFAULT_MATERIAL.kineticFriction, stribeckVelocity_mps: DEFAULT_MATERIAL.stribeckVelocity_mps, basis: 'default dry floor (bound below it)' };
  }
  const staticFriction = Math.ceil(bound * 1000) / 1000;
  return { staticFriction, kineticFriction: r3((staticFriction * DEFAULT_MATERIAL.kineticFriction) / DEFAULT_MATERIAL.staticFriction), stribeckVelocity_mps: DEFAULT_MATERIAL.stribeckVelocity_mps, basis: 'lower bound' };
}

export function regionComment(region: RegionEstimate): string {
  const s = region.samples;
  const counts = `${s.loaded} loaded samples (${s.stick} sticking, ${s.slide} sliding in ${region.slideEvents} slide events)`;
  const bound = region.staticLowerBound === null ? 'no bound' : `μs ≥ ${region.staticLowerBound.toFixed(3)}`;
  if (region.verdict === 'slid') {
    const st = region.staticFriction!;
    const k = region.kineticFriction!;
    return `${counts}; ${bound}; μs ∈ [${st.lower.toFixed(3)}, ${st.upper.toFixed(3)}], μk ∈ [${k.lower.toFixed(3)}, ${k.upper.toFixed(3)}] (μk 95 %)${region.stribeckVelocity_mps !== undefined ? `, v_s ${region.stribeckVelocity_mps.toFixed(4)} m/s` : ""}`;
  }
  return `${counts}; ${bound} only (${region.reason}); μk unknown`;
}

export function scenarioYaml(d: ScenarioDraft): string {
  const tr = d.trajectory;
  const q = tr.trunkQuaternion.subarray(0, 4);
  const rpy = rollPitchYawFromQuaternion(new Float64Array(3), q);
  const rpy_deg = [...rpy].map((a) => r3((a * 180) / Math.PI));
  const position = [0, 1, 2].map((c) => r4(tr.trunkPosition_m[c]));
  const velocity = [0, 1, 2].map((c) => r3(tr.trunkVelocity_mps[c]));
  const firstGait = d.commands[0]?.gait ?? 'stand';
  const settled = firstGait === 'stand' && Math.hypot(velocity[0], velocity[1], velocity[2]) < SETTLED_SPEED_mps;
  const lastTime = tr.t_s[tr.count - 1];
  const duration_s = Math.floor(lastTime * 1000) / 1000;

  const out: string[] = [];
  for (const line of d.provenance) out.push(`# ${line}`);
  out.push(
    'format: footing-scenario',
    'formatVersion: 1',
    `id: ${d.id}`,
    `revision: ${d.revision}`,
    `title: ${JSON.stringify(d.title)}`,
    `description: ${JSON.stringify(`Imported from a robot log: ${d.provenance.join(' ')}`)}`,
    'tags: [recorded]',
    `robot: robots/${d.robotFileName}`,
    `duration_s: ${duration_s}`,
  );
  if (d.controlRate_Hz !== undefined) out.push(`control: { rate_Hz: ${d.controlRate_Hz} }`);
  if (settled) {
    out.push('# The robot was standing at the first sample: a settled start (feet under the hips).');
    out.push(`initial: { position_m: ${list(position)}, rpy_deg: ${list(rpy_deg)}, feet: standing }`);
  } else {
    const feet = Array.from({ length: tr.footCount }, (_, i) => list([0, 1, 2].map((c) => r4(c === 2 ? Math.max(0, tr.footPosition_m[3 * i + c]) : tr.footPosition_m[3 * i + c]))));
    out.push('# The robot was moving at the first sample: its logged state, feet where they were.');
    out.push(`initial: { position_m: ${list(position)}, rpy_deg: ${list(rpy_deg)}, velocity_mps: ${list(velocity)}, feet: [${feet.join(', ')}] }`);
  }
  out.push('ground:');
  out.push(`  # Friction identified per ${d.friction.cell_m} m cell from the log (harness/recorded/friction.ts, docs/recorded.md);`);
  out.push('  # cells no loaded foot touched keep the default dry floor. Full figures: the .friction.json beside this file.');
  out.push(`  material: { name: default dry floor, staticFriction: ${DEFAULT_MATERIAL.staticFriction}, kineticFriction: ${DEFAULT_MATERIAL.kineticFriction} }`);
  if (d.friction.regions.length > 0) {
    out.push('  patches:');
    for (const region of d.friction.regions) {
      const m = regionMaterial(region);
      out.push(`    # ${regionComment(region)} → ${m.basis}`);
      out.push(`    - name: cell ${region.i} ${region.j}`);
      out.push(`      rect: { min_m: ${list(region.min_m.map(r4))}, max_m: ${list(region.max_m.map(r4))} }`);
      out.push(`      material: { staticFriction: ${m.staticFriction}, kineticFriction: ${m.kineticFriction}, stribeckVelocity_mps: ${m.stribeckVelocity_mps} }`);
    }
  }
  out.push(`# Commands: the logged operator commands, merged into constant segments (harness/recorded/commandTimeline.ts).`);
  out.push('commands:');
  for (const c of d.commands) out.push(`  - { at_s: ${c.at_s}, gait: ${c.gait}, velocity_mps: ${list(c.velocity_mps!)}, yawRate_radps: ${c.yawRate_radps} }`);
  if (d.push.t_s.length > 0) {
    out.push(`# Push: from the log's ${d.push.source === 'externalForce' ? 'external-force estimate' : 'residual m·a − Σf − m·g (assumptions in docs/recorded.md)'}, samples above ${d.push.threshold_N.toFixed(1)} N; peak ${d.push.peak_N.toFixed(1)} N.`);
    out.push('pushes:');
    out.push(`  - { series: ${d.pushFile}, at_s: 0, point_m: ${list(d.pushPoint_m)} }`);
  }
  out.push('# The recorded trajectory replay compares with (footing replay); its sha256 is part of this scenario.');
  out.push(`recorded: { trajectory: ${d.trajectoryFile}, sha256: ${d.trajectorySha256} }`);
  out.push('# A recorded run has no thresholds of its own: set them once the recording reproduces (docs/recorded.md).');
  out.push('acceptance: { mustNotFall: true }');
  return out.join('\n') + '\n';
}

export function pushCsv(push: PushEstimate): string {
  const lines = [`# Push series imported from a robot log (${push.source}); force on the trunk, world frame.`, 't_s,fx_N,fy_N,fz_N'];
  push.t_s.forEach((t, k) => lines.push(`${t},${push.force_N[k].join(',')}`));
  return lines.join('\n') + '\n';
}

export function scenarioFileNames(id: string, robotFile: string) {
  return { scenario: `${id}.yaml`, trajectory: `${id}.trajectory.csv`, push: `${id}.push.csv`, friction: `${id}.friction.json`, robot: path.basename(robotFile) };
}
