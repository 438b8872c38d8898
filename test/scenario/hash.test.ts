import { describe, expect, it } from 'vitest';
import { canonicalJson, compareIdentity, scenarioHash } from '../../harness/scenario/index.js';
import { createHash } from 'node:crypto';
import { BASE_YAML, load } from './helpers.js';

describe('canonical JSON', () => {
  it('sorts keys, drops whitespace and prints numbers as ECMAScript does (RFC 8785 rules)', () => {
    expect(canonicalJson({ b: [1, 2.5, 1e21, -0], a: { d: null, c: 'x"y' }, u: undefined })).toBe('{"a":{"c":"x\\"y","d":null},"b":[1,2.5,1e+21,0]}');
  });

  it('refuses values without a JSON form', () => {
    expect(() => canonicalJson({ a: Number.NaN })).toThrow(TypeError);
  });
});

describe('scenario hash', () => {
  it('is the sha256 of the canonical JSON without hash and file', async () => {
    const r = await load(BASE_YAML);
    if (!r.ok) throw new Error('fixture failed');
    const s = r.scenarios[0];
    const { hash, file, ...content } = s;
    expect(hash).toBe(createHash('sha256').update(canonicalJson(content)).digest('hex'));
    expect(scenarioHash({ ...s, file: 'elsewhere.yaml', hash: 'x' })).toBe(hash);
    void file;
  });

  it('is stable across key order and between YAML and JSON', async () => {
    const yaml = await load(BASE_YAML);
    const reordered = await load(`commands:
  - { gait: stand, at_s: 0 }
  - { velocity_mps: [0.5, 0, 0], gait: trot, at_s: 1 }
ground:
  material: { kineticFriction: 0.7, staticFriction: 0.9 }
duration_s: 8
robot: robots/quad-24kg.yaml
title: Test walk
revision: 1
id: test-walk
formatVersion: 1
format: footing-scenario
`);
    const json = await load(
      JSON.stringify({ title: 'Test walk', id: 'test-walk', format: 'footing-scenario', formatVersion: 1, revision: 1, robot: '../robots/quad-24kg.yaml', duration_s: 8, ground: { material: { staticFriction: 0.9, kineticFriction: 0.7 } }, commands: [{ at_s: 0, gait: 'stand' }, { at_s: 1, gait: 'trot', velocity_mps: [0.5, 0, 0] }] }),
      undefined,
      '/suite/other/s.json',
    );
    if (!yaml.ok || !reordered.ok || !json.ok) throw new Error('fixture failed');
    expect(reordered.scenarios[0].hash).toBe(yaml.scenarios[0].hash);
    expect(json.scenarios[0].hash).toBe(yaml.scenarios[0].hash);
    expect(json.scenarios[0].file).toBe('other/s.json');
  });

  it('does not change with comments, descriptions or explicit defaults, but changes with content', async () => {
    const base = await load(BASE_YAML);
    const annotated = await load(`# a comment\n${BASE_YAML}description: notes only\nseed: 0\nphysics: { step_s: 0.0005 }\n`);
    const changed = await load(BASE_YAML.replace('staticFriction: 0.9', 'staticFriction: 0.91'));
    if (!base.ok || !annotated.ok || !changed.ok) throw new Error('fixture failed');
    expect(annotated.scenarios[0].hash).toBe(base.scenarios[0].hash);
    expect(changed.scenarios[0].hash).not.toBe(base.scenarios[0].hash);
  });

  it('changes when the referenced robot file changes', async () => {
    const { ROBOT_TEXT } = await import('./helpers.js');
    const base = await load(BASE_YAML);
    const heavier = await load(BASE_YAML, { '/suite/robots/quad-24kg.yaml': ROBOT_TEXT.replace('mass_kg: 23', 'mass_kg: 24') });
    if (!base.ok || !heavier.ok) throw new Error('fixture failed');
    expect(heavier.scenarios[0].hash).not.toBe(base.scenarios[0].hash);
  });
});

describe('baseline identity', () => {
  it('warns when the hash changed but the revision did not', () => {
    const a = { id: 's', revision: 2, hash: 'a'.repeat(64) };
    expect(compareIdentity(a, a)).toEqual({ kind: 'same' });
    expect(compareIdentity(a, { ...a, hash: 'b'.repeat(64) }).kind).toBe('changedWithoutRevision');
    expect(compareIdentity(a, { ...a, revision: 3, hash: 'b'.repeat(64) }).kind).toBe('revised');
    expect(compareIdentity(a, { ...a, id: 't' }).kind).toBe('otherScenario');
  });
});
