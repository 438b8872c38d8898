import { mkdtemp, mkdir, rm, symlink, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { checkPaths } from '../../harness/commands/check.js';
import { loadScenarioFile, loadSuite } from '../../harness/scenario/index.js';
import { BASE_YAML, REPO, ROBOT_TEXT } from './helpers.js';

const LIBRARY = path.join(REPO, 'scenarios');

describe('the bundled library', () => {
  it('passes footing check with exit code 0', async () => {
    const r = await checkPaths([LIBRARY], { cwd: REPO });
    expect(r.lines.filter((l) => !/: ok( \(.*\))?$/.test(l) && !l.startsWith('checked '))).toEqual([]);
    expect(r.exitCode).toBe(0);
  });

  it('covers the cases the issue lists, with at least 12 scenarios on quad-24kg', async () => {
    const suite = await loadSuite([LIBRARY], { cwd: REPO });
    expect(suite.ok).toBe(true);
    const ids = suite.scenarios.map((s) => s.id);
    expect(ids.length).toBeGreaterThanOrEqual(12);
    for (const id of ['dry-baseline-walk', 'slick-patch-abrupt', 'mopped-corridor-crossing', 'frosty-dock-ice-patch', 'washdown-dry-wet-dry', 'ice-strip-diagonal', 'lateral-push-dry', 'lateral-push-wet', 'yaw-push-offcentre', 'ramp-uphill', 'ramp-downhill', 'ramp-stand-near-limit', 'checkerboard-tiles', 'wet-floor-turn', 'wet-start-stop', 'recorded-shove', 'hall-friction-0p2']) {
      expect(ids).toContain(id);
    }
    for (const s of suite.scenarios) {
      expect(s.duration_s).toBeGreaterThanOrEqual(6);
      expect(s.duration_s).toBeLessThanOrEqual(10);
      expect(s.commands[0].gait).toBe('stand');
      expect(s.plant.initial.feet).toBe('standing');
      expect(s.plant.initial.position_m[2]).toBe(s.plant.robot.standingHeight_m);
      const trot = s.commands.find((c) => c.gait === 'trot');
      if (trot) {
        expect(trot.at_s).toBeGreaterThanOrEqual(0.5);
        expect(Math.hypot(...trot.velocity_mps)).toBeGreaterThanOrEqual(0.3);
        expect(Math.hypot(...trot.velocity_mps)).toBeLessThanOrEqual(0.6);
      }
    }
  });

  it('has the headline case: an abrupt step to 0.6 m/s onto a μs = 0.2 floor', async () => {
    const r = await loadScenarioFile(path.join(LIBRARY, 'slick-patch-abrupt.yaml'), { cwd: REPO });
    if (!r.ok) throw new Error(r.errors.map((e) => e.message).join('\n'));
    const s = r.scenarios[0];
    expect(s.plant.robot.id).toBe('quad-24kg');
    // μs 0.2 is a slippery floor for legged walking (common practice).
    expect(s.plant.ground.friction.patches[0].material.staticFriction).toBe(0.2);
    expect(s.commands.map((c) => c.velocity_mps[0])).toEqual([0, 0.6, 0]);
  });

  it('keeps the standing-on-incline case beyond what the inscribed friction pyramid allows but inside the cone', async () => {
    const r = await loadScenarioFile(path.join(LIBRARY, 'ramp-stand-near-limit.yaml'), { cwd: REPO });
    if (!r.ok) throw new Error('failed');
    const g = r.scenarios[0].plant.ground;
    const needed = Math.tan((g.incline_deg.pitch * Math.PI) / 180); // block on a slope: μ ≥ tan θ
    expect(needed).toBeLessThan(g.friction.default.staticFriction);
    // More than the inscribed square pyramid μs/√2 allows (common practice in force distribution),
    // so a build that clips into that pyramid slides, while the true cone still holds the robot.
    expect(needed).toBeGreaterThan(g.friction.default.staticFriction / Math.SQRT2);
  });

  it('asks the near-limit ramp for a walk across its contour after a settled stand, then a stop and a hold', async () => {
    const r = await loadScenarioFile(path.join(LIBRARY, 'ramp-stand-near-limit.yaml'), { cwd: REPO });
    if (!r.ok) throw new Error(r.errors.map((e) => e.message).join('\n'));
    const s = r.scenarios[0];
    expect(s.plant.initial.start).toBe('settled');
    expect(s.plant.ground.incline_deg.roll).toBe(0); // downhill is −x, so the contour is ±y
    const [stand, walk, stop] = s.commands;
    expect(s.commands).toHaveLength(3);
    expect([stand.gait, walk.gait, stop.gait]).toEqual(['stand', 'trot', 'stand']);
    expect(walk.at_s).toBeGreaterThanOrEqual(1); // a settled stand held before the walk
    expect(walk.velocity_mps[0]).toBe(0); // across, not up or down the slope
    expect(Math.abs(walk.velocity_mps[1])).toBeGreaterThan(0);
    expect(s.duration_s - stop.at_s).toBeGreaterThanOrEqual(2); // the hold after the stop
  });

  it('loads in a deterministic order with stable hashes', async () => {
    const a = await loadSuite([LIBRARY], { cwd: REPO });
    const b = await loadSuite([path.join(LIBRARY, 'wet-start-stop.yaml'), LIBRARY], { cwd: REPO });
    expect(b.scenarios.map((s) => [s.id, s.hash])).toEqual(a.scenarios.map((s) => [s.id, s.hash]));
  });
});

describe('suites on disk', () => {
  let dir: string;
  beforeAll(async () => {
    dir = await mkdtemp(path.join(os.tmpdir(), 'footing-scenario-'));
    await mkdir(path.join(dir, 'suite', 'robots'), { recursive: true });
    await mkdir(path.join(dir, 'suite', 'wet'), { recursive: true });
    await writeFile(path.join(dir, 'suite', 'robots', 'quad-24kg.yaml'), ROBOT_TEXT);
    await writeFile(path.join(dir, 'suite', 'a.yaml'), BASE_YAML);
    await writeFile(path.join(dir, 'suite', 'wet', 'b.yaml'), BASE_YAML.replace('robots/', '../robots/'));
    await writeFile(path.join(dir, 'suite', 'wet', 'c.yaml'), BASE_YAML.replace('id: test-walk', 'id: other').replace('duration_s: 8', 'duration_s: -1').replace('robots/', '../robots/'));
    await writeFile(path.join(dir, 'suite', 'notes.json'), '{"hello": 1}');
    await writeFile(path.join(dir, 'secret.csv'), 't_s,fx_N,fy_N,fz_N\n0,0,0,0\n1,0,0,0\n');
    await symlink(path.join(dir, 'secret.csv'), path.join(dir, 'suite', 'link.csv'));
    await writeFile(path.join(dir, 'suite', 'linked.yaml'), BASE_YAML.replace('id: test-walk', 'id: linked') + 'pushes:\n  - { series: link.csv }\n');
  });
  afterAll(async () => {
    await rm(dir, { recursive: true, force: true });
  });

  it('prints one line per file, the errors indented, and exits 2', async () => {
    const r = await checkPaths(['suite'], { cwd: dir });
    expect(r.exitCode).toBe(2);
    expect(r.lines).toEqual([
      'suite/a.yaml: ok',
      'suite/linked.yaml: 1 error',
      `  suite/linked.yaml:14:15 /pushes/0/series: series file "link.csv" is a link to ${path.join(dir, 'secret.csv')}, outside the suite folder ${path.join(dir, 'suite')} (references must stay inside the suite folder)`,
      'suite/notes.json: 2 errors',
      '  suite/notes.json:1:1 /: missing required field "format" (expected format: footing-scenario)',
      '  suite/notes.json:1:1 /: missing required field "formatVersion" (expected formatVersion: 1)',
      'suite/robots/quad-24kg.yaml: ok (robot)',
      'suite/wet/b.yaml: 1 error',
      '  suite/wet/b.yaml:3:5 /id: id test-walk is already used by suite/a.yaml (expected ids unique in a suite)',
      'suite/wet/c.yaml: 1 error',
      '  suite/wet/c.yaml:7:13 /duration_s: -1 is out of range (expected duration_s > 0)',
      'checked 6 files: 2 ok, 4 with errors; 1 scenario',
    ]);
  });

  it('reports a path that does not exist', async () => {
    const r = await checkPaths(['nowhere'], { cwd: dir });
    expect(r.exitCode).toBe(2);
    expect(r.lines[0]).toBe('nowhere: no such file or folder');
  });

  it('loads a single file with the default suite root (its folder)', async () => {
    const r = await loadScenarioFile(path.join(dir, 'suite', 'a.yaml'));
    expect(r.ok).toBe(true);
  });
});
