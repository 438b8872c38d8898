import { describe, expect, it } from 'vitest';
import { formatIssue } from '../../harness/scenario/index.js';
import { BASE_YAML, edit, errorLines, errorsOf, load } from './helpers.js';

describe('the base fixture', () => {
  it('loads into one resolved scenario with defaults filled', async () => {
    const r = await load(BASE_YAML);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const s = r.scenarios[0];
    expect(s.id).toBe('test-walk');
    expect(s.file).toBe('s.yaml');
    expect(s.hash).toMatch(/^[0-9a-f]{64}$/);
    // Plant defaults: harness/plant/defaults.ts (0.5 ms step, 1 kHz, budget = one period = 1000 µs).
    expect(s.plant.physics.step_s).toBe(0.0005);
    expect(s.control).toEqual({ rate_Hz: 1000, loopBudget_us: 1000 });
    expect(s.plant.initial).toEqual({ position_m: [0, 0, 0.3], rpy_deg: [0, 0, 0], velocity_mps: [0, 0, 0], angularVelocity_radps: [0, 0, 0], feet: 'standing', start: 'settled' });
    expect(s.plant.ground.friction.default).toEqual({ name: 'dry floor', staticFriction: 0.9, kineticFriction: 0.7, stribeckVelocity_mps: 0.02, stribeckExponent: 2, viscous_Ns_per_m: 0 });
    expect(s.commands[0]).toEqual({ at_s: 0, gait: 'stand', velocity_mps: [0, 0, 0], yawRate_radps: 0 });
    expect(s.sensing).toEqual({ frictionEstimate: { kind: 'truth' }, forceNoise_N: 0 });
    expect(s.acceptance).toEqual({ mustNotFall: true, minFrictionMargin: null, maxSlipDistance_m: null, maxCommandedViolations: null, minProgress: null });
    expect(s.tags).toEqual([]);
    expect(s.plant.robot.hips_m).toHaveLength(4);
  });
});

describe('schema errors name file, line, column, path and expectation', () => {
  it('formats the kinetic > static error exactly as documented', async () => {
    const lines = await errorLines(edit([['{ staticFriction: 0.9, kineticFriction: 0.7 }', '{ staticFriction: 0.7, kineticFriction: 0.9 }']]));
    expect(lines).toEqual(['s.yaml:9:53 /ground/material/kineticFriction: kinetic friction 0.9 exceeds static friction 0.7 (expected kineticFriction ≤ staticFriction)']);
  });

  it('offers the nearest known key for an unknown field, pointing at the key', async () => {
    const [e] = await errorsOf(edit([['kineticFriction: 0.7 }', 'kineticFriction: 0.7, stribeckVelocity: 0.02 }']]));
    expect(e).toMatchObject({ path: '/ground/material/stribeckVelocity', line: 9, column: 58, message: 'unknown field "stribeckVelocity"', hint: 'did you mean "stribeckVelocity_mps"?' });
  });

  it('reports a missing required field at its parent', async () => {
    const [e] = await errorsOf(edit([['duration_s: 8\n', '']]));
    expect(e.path).toBe('');
    expect(e.message).toMatch(/^missing required field "duration_s"/);
    expect(e.line).toBe(1);
  });

  it('reports a wrong type with the value and the expected type', async () => {
    const [e] = await errorsOf(edit([['duration_s: 8', 'duration_s: eight']]));
    expect(e).toMatchObject({ path: '/duration_s', line: 7, column: 13 });
    expect(e.message).toMatch(/^"eight" is a string, expected a number/);
  });

  it('suggests the nearest gait for a misspelt enum value', async () => {
    const [e] = await errorsOf(edit([['gait: trot,', 'gait: trott,']]));
    expect(e).toMatchObject({ path: '/commands/1/gait', message: '"trott" is not one of "stand", "trot"', hint: 'did you mean "trot"?' });
  });

  it('refuses a duration that is not positive', async () => {
    const [e] = await errorsOf(edit([['duration_s: 8', 'duration_s: 0']]));
    expect(e).toMatchObject({ path: '/duration_s', message: '0 is out of range (expected duration_s > 0)' });
  });

  it('explains an invalid id', async () => {
    const [e] = await errorsOf(edit([['id: test-walk', 'id: Test_Walk']]));
    expect(e.path).toBe('/id');
    expect(e.message).toContain('lowercase letters and digits in words joined by single hyphens');
  });

  it('gives the exact count for fixed-length vectors', async () => {
    const [e] = await errorsOf(edit([['velocity_mps: [0.5, 0, 0]', 'velocity_mps: [0.5, 0]']]));
    expect(e).toMatchObject({ path: '/commands/1/velocity_mps' });
    expect(e.message).toMatch(/^has 2 items, expected exactly 3/);
  });

  it('refuses NaN and infinities spelt in YAML, and literals that overflow', async () => {
    const errors = await errorsOf(edit([['duration_s: 8', 'duration_s: .inf'], ['staticFriction: 0.9', 'staticFriction: .NaN'], ['kineticFriction: 0.7', 'kineticFriction: 1e400']]));
    const byPath = Object.fromEntries(errors.map((e) => [e.path, e.message]));
    expect(byPath['/duration_s']).toBe('`.inf` is not a finite number (NaN and infinities are refused; expected a finite number)');
    expect(byPath['/ground/material/staticFriction']).toMatch(/^`\.NaN` is not a finite number/);
    expect(byPath['/ground/material/kineticFriction']).toMatch(/the literal overflows a double/);
    expect(errors).toHaveLength(3); // no second "must be number" from the schema
  });

  it('reports YAML syntax errors with their position', async () => {
    const [e] = await errorsOf('format: footing-scenario\nid: [unclosed\n');
    expect(e.line).toBeGreaterThanOrEqual(2);
    expect(e.message).toMatch(/^YAML\/JSON syntax:/);
  });

  it('refuses duplicate keys', async () => {
    const [e] = await errorsOf(BASE_YAML + 'duration_s: 9\n');
    expect(e.message).toContain('Map keys must be unique');
    expect(e.line).toBe(13);
  });

  it('refuses an empty file and a non-mapping file', async () => {
    expect((await errorsOf(''))[0].message).toBe('the file is empty (expected a mapping starting with format: footing-scenario)');
    expect((await errorsOf('- 1\n- 2\n'))[0].message).toBe('the file holds a list (expected a mapping starting with format: footing-scenario)');
  });

  it('recognises a robot file given as a scenario', async () => {
    const [e] = await errorsOf('format: footing-robot\nformatVersion: 1\n');
    expect(e).toMatchObject({ path: '/format', line: 1, column: 9 });
    expect(e.message).toContain('this is a robot description');
  });

  it('refuses an unknown format with a suggestion', async () => {
    const [e] = await errorsOf(edit([['format: footing-scenario', 'format: footing-scenaro']]));
    expect(e).toMatchObject({ path: '/format', hint: 'did you mean "footing-scenario"?' });
  });

  it('refuses a newer format version naming both versions', async () => {
    const [e] = await errorsOf(edit([['formatVersion: 1', 'formatVersion: 3']]));
    expect(e).toMatchObject({ path: '/formatVersion', line: 2, column: 16 });
    expect(e.message).toBe('the file is format version 3, but this Footing knows scenario format versions 0 to 1; update Footing to read it');
  });

  it('refuses recursive aliases and very deep nesting without throwing', async () => {
    expect((await errorsOf(BASE_YAML + 'tags: &t [*t]\n'))[0].message).toContain('refers to itself');
    const deep = BASE_YAML + 'description: ' + '['.repeat(100) + ']'.repeat(100) + '\n';
    expect((await errorsOf(deep))[0].message).toContain('nesting deeper than 64 levels');
  });

  it('reports every error of a file at once, in line order', async () => {
    const text = edit([
      ['id: test-walk', 'id: Test'],
      ['duration_s: 8', 'duration_s: -2'],
      ['gait: trot,', 'gait: walk,'],
    ]);
    const errors = await errorsOf(text);
    expect(errors.map((e) => e.path)).toEqual(['/id', '/duration_s', '/commands/1/gait']);
    expect(errors.map((e) => e.line)).toEqual([3, 7, 12]);
  });

  it('reads JSON with the same positions and messages', async () => {
    const json = JSON.stringify({ format: 'footing-scenario', formatVersion: 1, id: 'j', revision: 1, title: 'J', robot: 'robots/quad-24kg.yaml', duration_s: 8, commands: [{ at_s: 0, gait: 'stnd' }] }, null, '\t');
    const [e] = await errorsOf(json, undefined, '/suite/s.json');
    expect(formatIssue(e)).toBe('s.json:12:12 /commands/0/gait: "stnd" is not one of "stand", "trot" (did you mean "stand"?)');
  });
});
