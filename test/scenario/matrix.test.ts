import { describe, expect, it } from 'vitest';
import { idFragment } from '../../harness/scenario/index.js';
import { BASE_YAML, edit, errorsOf, load } from './helpers.js';

const MATRIX_AXES = edit([
  ['id: test-walk', 'matrix:\n  axes:\n    mu: [0.2, 0.6]\n    speed: [0.3, 0.5]\nid: hall-mu${mu}-v${speed}'],
  ['title: Test walk', 'title: Hall at μs ${mu}, ${speed} m/s'],
  ['{ staticFriction: 0.9, kineticFriction: 0.7 }', '{ staticFriction: "${mu}", kineticFriction: 0.1 }'],
  ['velocity_mps: [0.5, 0, 0]', 'velocity_mps: ["${speed}", 0, 0]'],
]);

describe('matrix expansion', () => {
  it('expands axes into every combination with id-safe derived ids, keeping number types', async () => {
    const r = await load(MATRIX_AXES);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.scenarios.map((s) => s.id)).toEqual(['hall-mu0p2-v0p3', 'hall-mu0p2-v0p5', 'hall-mu0p6-v0p3', 'hall-mu0p6-v0p5']);
    expect(r.scenarios[1].title).toBe('Hall at μs 0.2, 0.5 m/s');
    expect(r.scenarios[1].plant.ground.friction.default.staticFriction).toBe(0.2);
    expect(r.scenarios[1].commands[1].velocity_mps).toEqual([0.5, 0, 0]);
    expect(new Set(r.scenarios.map((s) => s.hash)).size).toBe(4);
  });

  it('expands an explicit list of cases', async () => {
    const text = edit([
      ['id: test-walk', 'matrix:\n  cases:\n    - { s: 0.2, k: 0.15 }\n    - { s: 0.45, k: 0.3 }\nid: hall-${s}'],
      ['{ staticFriction: 0.9, kineticFriction: 0.7 }', '{ staticFriction: "${s}", kineticFriction: "${k}" }'],
    ]);
    const r = await load(text);
    expect(r.ok && r.scenarios.map((s) => [s.id, s.plant.ground.friction.default.kineticFriction])).toEqual([
      ['hall-0p2', 0.15],
      ['hall-0p45', 0.3],
    ]);
  });

  it('reports a template error once and a case-specific error with its case', async () => {
    const text = edit([
      ['id: test-walk', 'matrix:\n  cases:\n    - { s: 0.2, k: 0.3 }\n    - { s: 0.45, k: 0.3 }\nid: hall-${s}'],
      ['{ staticFriction: 0.9, kineticFriction: 0.7 }', '{ staticFriction: "${s}", kineticFriction: "${k}" }'],
      ['duration_s: 8', 'duration_s: -8'],
    ]);
    const errors = await errorsOf(text);
    expect(errors.map((e) => `${e.path}: ${e.message}`)).toEqual([
      '/duration_s: -8 is out of range (expected duration_s > 0)',
      '/ground/material/kineticFriction: in matrix case s=0.2, k=0.3: kinetic friction 0.3 exceeds static friction 0.2 (expected kineticFriction ≤ staticFriction)',
    ]);
  });

  it('refuses an unknown placeholder with a suggestion', async () => {
    const text = edit([['id: test-walk', 'matrix:\n  axes:\n    mu: [0.2, 0.6]\nid: hall-${mu}'], ['title: Test walk', 'title: Hall ${muu}']]);
    const [e] = await errorsOf(text);
    expect(e).toMatchObject({ path: '/title', line: 8, message: '${muu} is not a matrix parameter (parameters: mu)', hint: 'did you mean ${mu}?' });
  });

  it('refuses an id without placeholders and ids that collide', async () => {
    const same = edit([['id: test-walk', 'matrix:\n  axes:\n    mu: [0.2, 0.6]\nid: test-walk']], BASE_YAML.replace('title: Test walk', 'title: Hall ${mu}'));
    expect((await errorsOf(same))[0].message).toBe('id "test-walk" has no ${…} placeholder, so every matrix scenario would get the same id (expected e.g. test-walk-${mu})');
    const collide = edit([['id: test-walk', 'matrix:\n  axes:\n    mu: [0.2, 0.6]\n    v: [1, 2]\nid: hall-${v}'], ['title: Test walk', 'title: ${mu}']]);
    expect((await errorsOf(collide))[0].message).toBe('matrix cases mu=0.2, v=1 and mu=0.6, v=1 both produce id "hall-1" (expected the id to contain every parameter that varies)');
  });

  it('refuses cases that name different parameters and a malformed matrix block', async () => {
    const text = edit([['id: test-walk', 'matrix:\n  cases:\n    - { s: 0.2 }\n    - { t: 0.4 }\nid: hall-${s}']]);
    expect((await errorsOf(text))[0].message).toBe('case names t but case 0 names s (expected every case to name the same parameters)');
    const both = edit([['id: test-walk', 'matrix:\n  axes: { a: [1] }\n  cases: [{ a: 1 }]\nid: hall-${a}']]);
    expect((await errorsOf(both))[0]).toMatchObject({ path: '/matrix', message: 'has 2 fields (axes, cases), expected exactly 1 — Expands this file into several scenarios: `axes` (every combination of the listed values) or `cases` (an explicit list of parameter sets). ${name} in any string is replaced by the parameter\'s value.' });
  });

  it('warns about a parameter that is never used', async () => {
    const text = edit([['id: test-walk', 'matrix:\n  axes:\n    mu: [0.2, 0.6]\n    unused: [1]\nid: hall-${mu}']]);
    const r = await load(text);
    expect(r.ok && r.warnings.map((w) => w.message)).toEqual(['matrix parameter "unused" is not used anywhere in the file']);
  });

  it('spells values id-safe', () => {
    expect([idFragment(0.2), idFragment(-1.5), idFragment(1e-7), idFragment('Wet Tile!'), idFragment(true)]).toEqual(['0p2', 'm1p5', '1em7', 'wet-tile', 'true']);
  });
});
