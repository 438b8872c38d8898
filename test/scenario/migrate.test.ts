import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { CURRENT_SCENARIO_VERSION, SCENARIO_MIGRATIONS, migrateScenario } from '../../harness/scenario/index.js';
import { PathMap, migrateV0toV1 } from '../../harness/scenario/migrate.js';
import { errorsOf, load } from './helpers.js';

const V0 = readFileSync(new URL('./fixtures/dock-ice-v0.yaml', import.meta.url), 'utf8');

const V1_EQUIVALENT = `format: footing-scenario
formatVersion: 1
id: dock-ice-v0
revision: 1
title: Frosty dock, draft layout
robot: robots/quad-24kg.yaml
physics: { step_s: 0.0005 }
duration_s: 8
seed: 3
initial: { position_m: [0, 0, 0.3] }
ground:
  incline_deg: { pitch: 5, roll: 0 }
  material: { staticFriction: 0.9, kineticFriction: 0.7, stribeckVelocity_mps: 0.02 }
  patches:
    - { name: ice, rect: { min_m: [2, -1], max_m: [3, 1] }, material: { staticFriction: 0.1, kineticFriction: 0.05 } }
commands:
  - { at_s: 0, gait: stand }
  - { at_s: 1, gait: trot, velocity_mps: [0.4, 0, 0], yawRate_radps: 0 }
pushes:
  - { at_s: 4, duration_s: 0.1, force_N: [0, 80, 0], shape: rect }
acceptance: { mustNotFall: true, maxSlipDistance_m: 0.05 }
`;

describe('migration table', () => {
  it('has one step per version below the current one', () => {
    for (let v = 0; v < CURRENT_SCENARIO_VERSION; v++) expect(typeof SCENARIO_MIGRATIONS[v]).toBe('function');
  });

  it('migrates the version-0 draft to the same resolved scenario (same hash) as its hand-written version 1', async () => {
    const migrated = await load(V0);
    const written = await load(V1_EQUIVALENT);
    expect(migrated.ok && written.ok).toBe(true);
    if (!migrated.ok || !written.ok) return;
    expect(migrated.scenarios[0]).toEqual(written.scenarios[0]);
    expect(migrated.scenarios[0].duration_s).toBe(8); // 16000 × 0.0005 s
    expect(migrated.warnings.map((w) => w.message)).toEqual([
      'format version 0 was migrated in memory to version 1; consider rewriting the file in version 1 (see docs/scenarios.md)',
    ]);
  });

  it('computes duration from steps with the default physics step when dt is absent', () => {
    const out = migrateV0toV1({ format: 'footing-scenario', formatVersion: 0, steps: 4000 }, new PathMap().beginStep());
    expect(out.duration_s).toBe(2); // 4000 × 0.5 ms (plant default step)
    expect(out.physics).toBeUndefined();
  });

  it('points errors found after migration at the original version-0 lines', async () => {
    const broken = V0.replace('friction_kinetic: 0.7', 'friction_kinetic: 0.95').replace('vx: 0.4', 'vx: fast');
    const errors = await errorsOf(broken);
    expect(errors.map((e) => `${e.line}:${e.column} ${e.path}: ${e.message}`)).toEqual([
      '14:21 /ground/friction_kinetic: kinetic friction 0.95 exceeds static friction 0.9 (expected kineticFriction ≤ staticFriction)',
      '20:29 /commands/1/vx: "fast" is a string, expected a number',
    ]);
  });

  it('refuses a version newer than the tool, naming both versions', () => {
    const r = migrateScenario({}, 2);
    expect(r).toEqual({ ok: false, message: 'the file is format version 2, but this Footing knows scenario format versions 0 to 1; update Footing to read it' });
  });

  it('maps nested moved pointers back through the recorded moves', () => {
    const paths = new PathMap();
    const ctx = paths.beginStep();
    ctx.moved('/limits', '/acceptance');
    ctx.moved('/limits/max_slip', '/acceptance/maxSlipDistance_m');
    expect(paths.toSource('/acceptance/maxSlipDistance_m')).toBe('/limits/max_slip');
    expect(paths.toSource('/acceptance/minProgress')).toBe('/limits/minProgress');
    expect(paths.toSource('/duration_s')).toBe('/duration_s');
  });
});
