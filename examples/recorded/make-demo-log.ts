// Makes the INVENTED "recorded" demo log: the plant runs examples/recorded/demo-truth.yaml (known
// floor friction: dry concrete μs 0.9 / μk 0.7 with a wet strip μs 0.2 / μk 0.12, and a 70 N side
// shove at 5.5 s) through ref:overtrusting, and a made-up state estimator logs it at 250 Hz with
// Gaussian sensor noise (seeded, so the files are reproducible byte for byte), in two forms:
// demo-wet-hall.csv and demo-wet-hall.mcap (JSON messages on four topics). The log map
// demo-wet-hall.map.yaml says where everything lives. Conventions picked to exercise the map:
// quaternions x-y-z-w, trunk velocity in the trunk (body) frame, gait as text.
//
//   npx tsx examples/recorded/make-demo-log.ts [out-folder] [--cdr]   (default: this folder)
//
// --cdr also writes demo-wet-hall.cdr.mcap: the same messages in ROS 2 CDR with ros2msg schemas
// (invented package demo_msgs), as a ROS 2 recorder would store them.

import { writeFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { McapWriter, type IWritable } from '@mcap/core';
import { parse as parseMessageDefinition } from '@foxglove/rosmsg';
import { MessageWriter } from '@foxglove/rosmsg2-serialization';
import { openBuild } from '../../harness/builds/loader.js';
import { parseBuildSpec } from '../../harness/builds/spec.js';
import { PushSchedule } from '../../harness/plant/pushes.js';
import { SeededRandom } from '../../harness/plant/random.js';
import { matrixFromQuaternion } from '../../harness/plant/rotation.js';
import { runEpisode } from '../../harness/run/episode.js';
import { controllerSetup } from '../../harness/run/runOne.js';
import { loadScenarioFile } from '../../harness/scenario/index.js';
import type { ResolvedScenario } from '../../harness/scenario/types.js';

const here = path.dirname(fileURLToPath(import.meta.url));
export const DEMO_BUILD = 'ref:overtrusting';
export const DEMO_LOG_NAME = 'demo-wet-hall';
/** Log every n-th control tick: 250 Hz at the scenario's 1 kHz. */
const LOG_EVERY_NTH_TICK = 4;
const FEET = ['FL', 'FR', 'HL', 'HR'];
/** Invented sensor noise (standard deviations per component), stated in the map's import block. */
export const DEMO_NOISE = { position_m: 0.0005, trunkVelocity_mps: 0.005, footVelocity_mps: 0.002, force_N: 1.5, externalForce_N: 2 } as const;

interface Row {
  t_s: number;
  p: number[]; q: number[]; vBody: number[];
  feet: { p: number[]; v: number[]; f: number[]; contact: boolean }[];
  cmd: { vx: number; vy: number; wz: number; gait: string };
  ext: number[];
}

const fixed = (x: number, d: number) => Number(x.toFixed(d)) + 0;

async function record(scenario: ResolvedScenario): Promise<Row[]> {
  const build = await openBuild(parseBuildSpec(DEMO_BUILD, here), controllerSetup(scenario));
  const random = new SeededRandom(0xdee0);
  const noisy = (x: number, sigma: number, d: number) => fixed(x + sigma * random.normal(), d);
  const pushes = new PushSchedule(scenario.plant.pushes);
  const wrench = new Float64Array(6);
  const clock = new Float64Array(1);
  const R = new Float64Array(9);
  const rows: Row[] = [];
  let tick = 0;
  const commandAt = (t: number) => {
    let step = scenario.commands[0];
    for (const c of scenario.commands) if (c.at_s <= t + 1e-9) step = c;
    return step;
  };
  try {
    await runEpisode(scenario, build, {
      observers: [{
        onTick(s, action) {
          if (++tick % LOG_EVERY_NTH_TICK !== 0) return;
          const N = DEMO_NOISE;
          matrixFromQuaternion(R, s.trunkQuaternion);
          const v = s.trunkVelocity_mps;
          // Body-frame velocity: Rᵀ·v.
          const vBody = [0, 1, 2].map((c) => R[c] * v[0] + R[3 + c] * v[1] + R[6 + c] * v[2]);
          clock[0] = s.time_s;
          pushes.wrenchAt(wrench, clock, R);
          const command = commandAt(s.time_s);
          rows.push({
            t_s: fixed(s.time_s, 6),
            p: [0, 1, 2].map((c) => noisy(s.trunkPosition_m[c], N.position_m, 6)),
            q: [1, 2, 3, 0].map((c) => fixed(s.trunkQuaternion[c], 7)),
            vBody: vBody.map((x) => noisy(x, N.trunkVelocity_mps, 5)),
            feet: FEET.map((_, i) => ({
              p: [0, 1, 2].map((c) => noisy(s.footPosition_m[3 * i + c], N.position_m, 6)),
              v: [0, 1, 2].map((c) => noisy(s.footVelocity_mps[3 * i + c], N.footVelocity_mps, 5)),
              f: [0, 1, 2].map((c) => noisy(s.footForce_N[3 * i + c], N.force_N, 3)),
              contact: action.mode[i] === 1,
            })),
            cmd: { vx: command.velocity_mps[0], vy: command.velocity_mps[1], wz: command.yawRate_radps, gait: command.gait },
            ext: [0, 1, 2].map((c) => noisy(wrench[c], N.externalForce_N, 3)),
          });
        },
      }],
    });
  } finally {
    await build.close();
  }
  return rows;
}

function csvText(rows: Row[]): string {
  const header = ['stamp_s', 'base_px_m', 'base_py_m', 'base_pz_m', 'base_qx', 'base_qy', 'base_qz', 'base_qw', 'base_vx_mps', 'base_vy_mps', 'base_vz_mps'];
  for (const f of FEET) header.push(`${f}_px_m`, `${f}_py_m`, `${f}_pz_m`, `${f}_vx_mps`, `${f}_vy_mps`, `${f}_vz_mps`, `${f}_fx_N`, `${f}_fy_N`, `${f}_fz_N`, `${f}_contact`);
  header.push('cmd_vx_mps', 'cmd_vy_mps', 'cmd_wz_radps', 'cmd_gait', 'ext_fx_N', 'ext_fy_N', 'ext_fz_N');
  const lines = [
    '# INVENTED demo log made by examples/recorded/make-demo-log.ts (the plant with known friction, not a robot).',
    '# Trunk velocity in the trunk frame; quaternion x y z w; foot forces are the ground on the foot.',
    header.join(','),
  ];
  for (const r of rows) {
    const cells: (number | string)[] = [r.t_s, ...r.p, ...r.q, ...r.vBody];
    for (const f of r.feet) cells.push(...f.p, ...f.v, ...f.f, f.contact ? 1 : 0);
    cells.push(r.cmd.vx, r.cmd.vy, r.cmd.wz, r.cmd.gait, ...r.ext);
    lines.push(cells.join(','));
  }
  return lines.join('\n') + '\n';
}

class MemoryWritable implements IWritable {
  private readonly chunks: Uint8Array[] = [];
  private size = 0n;
  async write(buffer: Uint8Array): Promise<void> {
    this.chunks.push(buffer.slice());
    this.size += BigInt(buffer.length);
  }
  position(): bigint {
    return this.size;
  }
  bytes(): Buffer {
    return Buffer.concat(this.chunks);
  }
}

/** ROS 2 message definitions (ros2msg text, dependencies appended) of the demo's topics. */
const SEPARATOR = '================================================================================';
const VECTOR3 = `MSG: demo_msgs/Vector3\nfloat64 x\nfloat64 y\nfloat64 z`;
const ROS2_DEFINITIONS: Record<string, string> = {
  'demo_msgs/BaseState': ['demo_msgs/Vector3 position\ndemo_msgs/Quaternion orientation\ndemo_msgs/Vector3 velocity_body', VECTOR3, 'MSG: demo_msgs/Quaternion\nfloat64 x\nfloat64 y\nfloat64 z\nfloat64 w'].join(`\n${SEPARATOR}\n`),
  'demo_msgs/FeetState': ['demo_msgs/Foot[] feet', 'MSG: demo_msgs/Foot\nstring name\ndemo_msgs/Vector3 position\ndemo_msgs/Vector3 velocity\ndemo_msgs/Vector3 force\nbool contact', VECTOR3].join(`\n${SEPARATOR}\n`),
  'demo_msgs/Command': ['demo_msgs/Planar linear\nfloat64 yaw_rate\nstring gait', 'MSG: demo_msgs/Planar\nfloat64 x\nfloat64 y'].join(`\n${SEPARATOR}\n`),
  'demo_msgs/ExternalForce': ['demo_msgs/Vector3 force', VECTOR3].join(`\n${SEPARATOR}\n`),
};

async function mcapBytes(rows: Row[], encoding: 'json' | 'cdr' = 'json'): Promise<Buffer> {
  const out = new MemoryWritable();
  const writer = new McapWriter({ writable: out });
  await writer.start({ profile: encoding === 'cdr' ? 'ros2' : '', library: 'footing demo-log generator' });
  const encoder = new TextEncoder();
  const encoders = new Map<number, (message: unknown) => Uint8Array>();
  const channel = async (topic: string, name: string) => {
    const cdrName = name.replace('demo.', 'demo_msgs/');
    const schemaId = encoding === 'json'
      ? await writer.registerSchema({ name, encoding: 'jsonschema', data: encoder.encode(JSON.stringify({ type: 'object', title: name })) })
      : await writer.registerSchema({ name: cdrName, encoding: 'ros2msg', data: encoder.encode(ROS2_DEFINITIONS[cdrName]) });
    const id = await writer.registerChannel({ topic, schemaId, messageEncoding: encoding, metadata: new Map([['note', 'invented demo data']]) });
    if (encoding === 'json') encoders.set(id, (message) => encoder.encode(JSON.stringify(message)));
    else {
      const cdr = new MessageWriter(parseMessageDefinition(ROS2_DEFINITIONS[cdrName], { ros2: true }));
      encoders.set(id, (message) => cdr.writeMessage(message));
    }
    return id;
  };
  const base = await channel('/estimator/base', 'demo.BaseState');
  const feet = await channel('/estimator/feet', 'demo.FeetState');
  const command = await channel('/operator/command', 'demo.Command');
  const external = await channel('/estimator/external_force', 'demo.ExternalForce');
  let sequence = 0;
  for (const r of rows) {
    const logTime = BigInt(Math.round(r.t_s * 1e9));
    const send = (channelId: number, message: unknown) =>
      writer.addMessage({ channelId, sequence: sequence++, logTime, publishTime: logTime, data: encoders.get(channelId)!(message) });
    const xyz = (v: number[]) => ({ x: v[0], y: v[1], z: v[2] });
    await send(base, { position: xyz(r.p), orientation: { x: r.q[0], y: r.q[1], z: r.q[2], w: r.q[3] }, velocity_body: xyz(r.vBody) });
    await send(feet, { feet: r.feet.map((f, i) => ({ name: FEET[i], position: xyz(f.p), velocity: xyz(f.v), force: xyz(f.f), contact: f.contact })) });
    await send(command, { linear: { x: r.cmd.vx, y: r.cmd.vy }, yaw_rate: r.cmd.wz, gait: r.cmd.gait });
    await send(external, { force: xyz(r.ext) });
  }
  await writer.end();
  return out.bytes();
}

/** Writes demo-wet-hall.csv and demo-wet-hall.mcap (and with `cdr`, demo-wet-hall.cdr.mcap) into `outDir`. */
export async function makeDemoLog(outDir: string, options: { cdr?: boolean } = {}): Promise<{ csv: string; mcap: string; cdrMcap?: string; samples: number }> {
  const loaded = await loadScenarioFile(path.join(here, 'demo-truth.yaml'), { suiteRoot: path.join(here, '..', '..') });
  if (!loaded.ok) throw new Error(`demo-truth.yaml: ${loaded.errors.map((e) => e.message).join('; ')}`);
  const rows = await record(loaded.scenarios[0]);
  const csv = path.join(outDir, `${DEMO_LOG_NAME}.csv`);
  const mcap = path.join(outDir, `${DEMO_LOG_NAME}.mcap`);
  writeFileSync(csv, csvText(rows));
  writeFileSync(mcap, await mcapBytes(rows));
  if (!options.cdr) return { csv, mcap, samples: rows.length };
  const cdrMcap = path.join(outDir, `${DEMO_LOG_NAME}.cdr.mcap`);
  writeFileSync(cdrMcap, await mcapBytes(rows, 'cdr'));
  return { csv, mcap, cdrMcap, samples: rows.length };
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const args = process.argv.slice(2);
  const outDir = path.resolve(args.find((a) => !a.startsWith('--')) ?? here);
  const made = await makeDemoLog(outDir, { cdr: args.includes('--cdr') });
  console.log(`wrote ${[made.csv, made.mcap, made.cdrMcap].filter(Boolean).join(', ')} (${made.samples} samples, invented data)`);
}
