import { describe, expect, it } from 'vitest';
import { loadRobotText } from '../../harness/scenario/index.js';
import { symmetricEigenvalues3 } from '../../harness/scenario/robot.js';
import { polygonProblem, segmentsIntersect } from '../../harness/scenario/geometry.js';
import { BASE_YAML, ROBOT_TEXT, edit, errorsOf, load } from './helpers.js';

const messages = async (text: string, files?: Record<string, string>) => (await errorsOf(text, files)).map((e) => `${e.path}: ${e.message}`);

describe('friction materials', () => {
  it('names the inherited value when a patch gives μs below the default μk', async () => {
    const moved = edit([['  material: { staticFriction: 0.9, kineticFriction: 0.7 }\n', '  material: { staticFriction: 0.9, kineticFriction: 0.7 }\n  patches:\n    - { name: ice, rect: { min_m: [1, -1], max_m: [2, 1] }, material: { staticFriction: 0.15 } }\n']]);
    expect(await messages(moved)).toEqual([
      '/ground/patches/0/material/staticFriction: kinetic friction 0.7 (inherited from the default material) exceeds static friction 0.15 (expected kineticFriction ≤ staticFriction)',
    ]);
  });

  it('lets patch materials inherit unspecified fields from the default material', async () => {
    const text = edit([['  material: { staticFriction: 0.9, kineticFriction: 0.7 }\n', '  material: { name: tile, staticFriction: 0.8, kineticFriction: 0.6, viscous_Ns_per_m: 3 }\n  patches:\n    - { name: wet, circle: { center_m: [2, 0], radius_m: 0.5 }, material: { staticFriction: 0.3, kineticFriction: 0.2 } }\n']]);
    const r = await load(text);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.scenarios[0].plant.ground.friction.patches[0]).toEqual({
      name: 'wet',
      shape: { kind: 'circle', center_m: [2, 0], radius_m: 0.5 },
      material: { name: 'wet', staticFriction: 0.3, kineticFriction: 0.2, stribeckVelocity_mps: 0.02, stribeckExponent: 2, viscous_Ns_per_m: 3 },
    });
  });
});

describe('patch shapes', () => {
  const withPatch = (patch: string) => edit([['  material: { staticFriction: 0.9, kineticFriction: 0.7 }\n', `  material: { staticFriction: 0.9, kineticFriction: 0.7 }\n  patches:\n    - ${patch}\n`]]);

  it('refuses a self-intersecting (bow-tie) polygon', async () => {
    expect(await messages(withPatch('{ polygon_m: [[0, 0], [1, 1], [1, 0], [0, 1]], material: {} }'))).toEqual([
      '/ground/patches/0/polygon_m/2: edges 0 (vertex 0→1) and 2 (vertex 2→3) cross (expected a simple polygon whose edges do not cross)',
    ]);
  });

  it('refuses a polygon that repeats its first vertex at the end', async () => {
    const [m] = await messages(withPatch('{ polygon_m: [[0, 0], [1, 0], [1, 1], [0, 0]], material: {} }'));
    expect(m).toBe('/ground/patches/0/polygon_m/3: the last vertex repeats the first (the polygon closes itself; leave the repeat out)');
  });

  it('refuses zero or two shapes and an inverted rect', async () => {
    expect(await messages(withPatch('{ material: {} }'))).toEqual(['/ground/patches/0: patch has no shape (expected exactly one of rect, circle, polygon_m)']);
    expect(await messages(withPatch('{ rect: { min_m: [2, 0], max_m: [1, 1] }, circle: { center_m: [0, 0], radius_m: 1 }, material: {} }'))).toEqual([
      '/ground/patches/0: patch has 2 shapes (rect, circle) (expected exactly one of rect, circle, polygon_m)',
      '/ground/patches/0/rect/max_m/0: rect max_m x 1 is not above min_m x 2 (expected min_m < max_m in x and y)',
    ]);
  });

  it('accepts the issue example ice strip as a simple polygon', () => {
    expect(polygonProblem([[1.0, -2], [1.6, -2], [3.6, 2], [3.0, 2]])).toBeUndefined();
  });

  it('detects touching and collinear overlapping segments (CLRS §33.1 cases)', () => {
    expect(segmentsIntersect([0, 0], [2, 0], [1, 0], [3, 0])).toBe(true);
    expect(segmentsIntersect([0, 0], [2, 0], [1, -1], [1, 0])).toBe(true);
    expect(segmentsIntersect([0, 0], [1, 0], [2, 0], [3, 0])).toBe(false);
    expect(segmentsIntersect([0, 0], [1, 1], [0, 1], [1, 2])).toBe(false);
  });
});

describe('raster', () => {
  const withRaster = (raster: string) => edit([['  material: { staticFriction: 0.9, kineticFriction: 0.7 }\n', `  material: { staticFriction: 0.9, kineticFriction: 0.7 }\n  raster: ${raster}\n`]]);

  it('refuses ragged rows and grids of different shapes', async () => {
    expect(await messages(withRaster('{ origin_m: [0, 0], cell_m: 0.5, staticFriction: [[0.5, 0.5], [0.5]], kineticFriction: [[0.4, 0.4], [0.4, 0.4]] }'))).toEqual([
      '/ground/raster/staticFriction/1: row 1 has 1 cell but row 0 has 2 (expected a rectangular grid)',
    ]);
    expect(await messages(withRaster('{ origin_m: [0, 0], cell_m: 0.5, staticFriction: [[0.5, 0.5]], kineticFriction: [[0.4], [0.4]] }'))).toEqual([
      '/ground/raster/kineticFriction: kineticFriction is 2×1 but staticFriction is 1×2 (expected the same shape)',
    ]);
  });

  it('checks μk ≤ μs per cell and needs both grids or a file', async () => {
    expect(await messages(withRaster('{ origin_m: [0, 0], cell_m: 0.5, staticFriction: [[0.5, 0.3]], kineticFriction: [[0.4, 0.4]] }'))).toEqual([
      '/ground/raster/kineticFriction/0/1: kinetic friction 0.4 exceeds static friction 0.3 in cell [0][1] (expected kineticFriction ≤ staticFriction)',
    ]);
    expect(await messages(withRaster('{ origin_m: [0, 0], cell_m: 0.5, staticFriction: [[0.5]] }'))).toEqual([
      '/ground/raster: raster gives only staticFriction (expected both staticFriction and kineticFriction, or file:)',
    ]);
  });

  it('reads a raster CSV, and names the CSV file and line of a bad row', async () => {
    const good = 'i,j,staticFriction,kineticFriction\n0,0,0.9,0.7\n0,1,0.3,0.2\n1,0,0.3,0.2\n1,1,0.9,0.7\n';
    const r = await load(withRaster('{ origin_m: [1, -1], cell_m: 0.5, file: maps/tiles.csv }'), { '/suite/maps/tiles.csv': good });
    expect(r.ok && r.scenarios[0].plant.ground.friction.raster).toEqual({ origin_m: [1, -1], cell_m: 0.5, staticFriction: [[0.9, 0.3], [0.3, 0.9]], kineticFriction: [[0.7, 0.2], [0.2, 0.7]] });
    const bad = 'i,j,staticFriction,kineticFriction\n0,0,0.9,0.7\n0,1,0.3,0.5\n1,1,0.9,0.7\n';
    const errors = await errorsOf(withRaster('{ origin_m: [1, -1], cell_m: 0.5, file: maps/tiles.csv }'), { '/suite/maps/tiles.csv': bad });
    expect(errors.map((e) => `${e.file}:${e.line} ${e.message}`)).toEqual([
      'maps/tiles.csv:3 kinetic friction 0.5 exceeds static friction 0.3 in cell (0, 1) (expected kineticFriction ≤ staticFriction)',
    ]);
  });
});

describe('commands, pushes and timing', () => {
  it('requires commands in time order starting at 0', async () => {
    expect(await messages(edit([['{ at_s: 0, gait: stand }', '{ at_s: 0.5, gait: stand }'], ['{ at_s: 1, gait: trot', '{ at_s: 0.5, gait: trot']]))).toEqual([
      '/commands/0/at_s: the first command starts at 0.5 s (expected the first command at_s: 0, so the controller has a command from the start)',
      '/commands/1/at_s: command at 0.5 s does not come after the previous one at 0.5 s (expected commands in strictly increasing at_s)',
    ]);
  });

  it('refuses a command that starts after the run', async () => {
    expect(await messages(BASE_YAML + '  - { at_s: 8, gait: stand }\n')).toEqual([
      '/commands/2/at_s: command at 8 s starts at or after the end of the run (duration_s 8; expected at_s < duration_s)',
    ]);
  });

  it('refuses a push that ends after the run, but allows one ending exactly at the end', async () => {
    expect(await messages(BASE_YAML + 'pushes:\n  - { at_s: 7.95, duration_s: 0.1, force_N: [0, 50, 0] }\n')).toEqual([
      '/pushes/0: push from 7.95 s to 8.05 s ends after the run (duration_s 8; expected at_s + duration_s ≤ 8)',
    ]);
    // 7.9 + 0.1 is 7.999999999999999 or 8.000000000000002 in doubles; both must pass.
    expect((await load(BASE_YAML + 'pushes:\n  - { at_s: 7.9, duration_s: 0.1, force_N: [0, 50, 0] }\n')).ok).toBe(true);
  });

  it('maps a pulse push to kind pulse with default shape and point', async () => {
    const r = await load(BASE_YAML + 'pushes:\n  - { at_s: 4, duration_s: 0.1, force_N: [0, 80, 0] }\n');
    expect(r.ok && r.scenarios[0].plant.pushes).toEqual([{ kind: 'pulse', shape: 'rect', at_s: 4, duration_s: 0.1, force_N: [0, 80, 0], point_m: [0, 0, 0] }]);
  });

  it('reads a series push, shifted by at_s, and refuses non-increasing times naming the CSV row', async () => {
    const push = 'pushes:\n  - { series: pushes/shove.csv, at_s: 2, point_m: [0.1, 0, 0] }\n';
    const r = await load(BASE_YAML + push, { '/suite/pushes/shove.csv': 't_s,fx_N,fy_N,fz_N\n0,0,0,0\n0.1,0,50,0\n0.2,0,0,0\n' });
    expect(r.ok && r.scenarios[0].plant.pushes[0]).toEqual({ kind: 'series', t_s: [2, 2.1, 2.2], force_N: [[0, 0, 0], [0, 50, 0], [0, 0, 0]], point_m: [0.1, 0, 0] });
    const errors = await errorsOf(BASE_YAML + push, { '/suite/pushes/shove.csv': '# comment\nt_s,fx_N,fy_N,fz_N\n0,0,0,0\n0.1,0,50,0\n0.1,0,x,0\n0.05,0,0,0\n' });
    expect(errors.map((e) => `${e.file}:${e.line} ${e.path}: ${e.message}`)).toEqual([
      'pushes/shove.csv:5 /pushes/0/series: fy_N "x" is not a finite number',
      'pushes/shove.csv:6 /pushes/0/series: t_s 0.05 is not after 0.1 on line 4 (expected strictly increasing t_s)',
    ]);
  });

  it('refuses a series CSV with a misspelt column, suggesting the right one', async () => {
    const errors = await errorsOf(BASE_YAML + 'pushes:\n  - { series: s.csv }\n', { '/suite/s.csv': 't_s,fx_N,fy_N,fz\n0,0,0,0\n1,0,0,0\n' });
    expect(errors.map((e) => [e.line, e.message, e.hint])).toEqual([
      [1, 'unknown column "fz" in the header (expected t_s,fx_N,fy_N,fz_N)', 'did you mean "fz_N"?'],
      [1, 'missing column "fz_N" in the header (expected t_s,fx_N,fy_N,fz_N)', undefined],
    ]);
  });

  it('requires the control period to be a whole number of physics steps', async () => {
    expect(await messages(BASE_YAML + 'physics: { step_s: 0.0003 }\n')).toEqual([
      '/physics/step_s: the control period 1 ms is not a whole number of physics steps of 0.3 ms (3.33333 steps; expected a whole number ≥ 1)',
    ]);
    expect((await load(BASE_YAML + 'physics: { step_s: 0.00025 }\ncontrol: { rate_Hz: 500 }\n')).ok).toBe(true);
  });

  it('checks that standing feet fit the leg range at the initial height', async () => {
    expect(await messages(BASE_YAML + 'initial: { position_m: [0, 0, 0.5] }\n')).toContain(
      '/initial/position_m/2: with feet standing, hip 0 is 0.5 m above the ground, outside the leg range [0.12, 0.42] m of robot quad-24kg',
    );
  });

  it('maps friction sensing variants', async () => {
    for (const [text, expected] of [
      ['truth', { kind: 'truth' }],
      ['{ constant: 0.5 }', { kind: 'constant', value: 0.5 }],
      ['{ scale: 1.2 }', { kind: 'scale', factor: 1.2 }],
    ] as const) {
      const r = await load(BASE_YAML + `sensing: { frictionEstimate: ${text}, forceNoise_N: 0.5 }\n`);
      expect(r.ok && r.scenarios[0].sensing).toEqual({ frictionEstimate: expected, forceNoise_N: 0.5 });
    }
  });
});

describe('references stay inside the suite folder', () => {
  it('refuses a .. escape with a clear message', async () => {
    const [e] = await errorsOf(edit([['robot: robots/quad-24kg.yaml', 'robot: ../../etc/passwd']]));
    expect(e.path).toBe('/robot');
    expect(e.message).toBe('robot file "../../etc/passwd" resolves to /etc/passwd, outside the suite folder /suite (references must stay inside the suite folder; ".." may not climb out of it)');
  });

  it('refuses absolute paths', async () => {
    const [e] = await errorsOf(BASE_YAML + 'pushes:\n  - { series: /tmp/x.csv }\n');
    expect(e.message).toContain('is an absolute path (expected a path relative to the scenario file');
  });

  it('allows .. that stays inside the suite', async () => {
    const r = await load(edit([['robot: robots/quad-24kg.yaml', 'robot: ../robots/quad-24kg.yaml']]), undefined, '/suite/wet/s.yaml');
    expect(r.ok).toBe(true);
  });

  it('names a missing referenced file', async () => {
    const [e] = await errorsOf(edit([['robot: robots/quad-24kg.yaml', 'robot: robots/none.yaml']]));
    expect(e.message).toBe('robot file "robots/none.yaml" cannot be read (ENOENT; resolved to robots/none.yaml)');
  });
});

describe('robot descriptions', () => {
  const robotErrors = (text: string) => {
    const r = loadRobotText(text, '/suite/robots/r.yaml', { cwd: '/suite' });
    return r.ok ? [] : r.errors.map((e) => `${e.path}: ${e.message}`);
  };

  it('loads the bundled quad-24kg', () => {
    const r = loadRobotText(ROBOT_TEXT, '/suite/robots/quad-24kg.yaml');
    expect(r.ok && r.robot.trunk.mass_kg).toBe(23);
  });

  it('refuses a non-symmetric inertia', () => {
    expect(robotErrors(ROBOT_TEXT.replace('[0.00, 0.72, 0.00]', '[0.02, 0.72, 0.00]'))).toEqual([
      '/trunk/inertia_kgm2/1/0: inertia is not symmetric: I[0][1] = 0 but I[1][0] = 0.02 (expected equal products of inertia)',
    ]);
  });

  it('refuses an inertia that is not positive definite', () => {
    expect(robotErrors(ROBOT_TEXT.replace('[0.20, 0.00, 0.01]', '[-0.20, 0.00, 0.01]'))).toEqual([
      '/trunk/inertia_kgm2: inertia is not positive definite (leading minor 1 is -0.2; expected all leading minors > 0)',
    ]);
  });

  it('refuses principal moments that violate the triangle inequality', () => {
    const errors = robotErrors(ROBOT_TEXT.replace('[0.20, 0.00, 0.01]', '[0.05, 0.00, 0.01]'));
    expect(errors).toHaveLength(1);
    expect(errors[0]).toMatch(/^\/trunk\/inertia_kgm2: principal moments .* violate the triangle inequality/);
  });

  it('refuses legs that cannot carry the trunk or reach the standing height', () => {
    expect(robotErrors(ROBOT_TEXT.replace('maxForce_N: 400', 'maxForce_N: 50'))).toEqual([
      "/leg/maxForce_N: 4 legs of at most 50 N cannot carry the trunk's weight of 225.6 N (expected legs × maxForce_N ≥ trunk mass × g)",
    ]);
    expect(robotErrors(ROBOT_TEXT.replace('standingHeight_m: 0.30', 'standingHeight_m: 0.45'))[0]).toMatch(/^\/standingHeight_m: standing at 0.45 m puts hip 0 at 0.45 m/);
  });

  it('reports errors inside a referenced robot file under that file, plus one line in the scenario', async () => {
    const errors = await errorsOf(BASE_YAML, { '/suite/robots/quad-24kg.yaml': ROBOT_TEXT.replace('mass_kg: 23', 'mass_kg: -23') });
    expect(errors.map((e) => `${e.file}:${e.line} ${e.path}: ${e.message}`)).toEqual([
      's.yaml:6 /robot: robot file "robots/quad-24kg.yaml" is invalid (1 error, listed under robots/quad-24kg.yaml)',
      'robots/quad-24kg.yaml:12 /trunk/mass_kg: -23 is out of range (expected mass_kg > 0)',
    ]);
  });

  it('computes eigenvalues that match a diagonal matrix and a known rotated case', () => {
    expect(symmetricEigenvalues3([[3, 0, 0], [0, 1, 0], [0, 0, 2]])).toEqual([1, 2, 3]);
    // [[2,1,0],[1,2,0],[0,0,5]] has eigenvalues 1, 3, 5 (2 ± 1 from the 2×2 block).
    const [a, b, c] = symmetricEigenvalues3([[2, 1, 0], [1, 2, 0], [0, 0, 5]]);
    expect(a).toBeCloseTo(1, 12);
    expect(b).toBeCloseTo(3, 12);
    expect(c).toBeCloseTo(5, 12);
  });
});
