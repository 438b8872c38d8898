// Scenario format versions and the migration table. A file of an older version is migrated in
// memory, one step at a time (v → v+1); each step records where it moved fields so that errors
// found in the migrated data still point at the line of the original file.
//
// Version 0 was the first-draft layout (never released; kept so the mechanism is exercised):
//
//   format: footing-scenario
//   formatVersion: 0
//   name: dock-ice                 # → id        (v0 had no revision; migrated files get revision 1)
//   title: ...
//   robot: robots/quad-24kg.yaml
//   dt: 0.0005                     # → physics.step_s (optional)
//   steps: 16000                   # → duration_s = steps × dt (dt or the default physics step)
//   seed: 3
//   start_height: 0.30             # → initial.position_m [0, 0, start_height]
//   ground:
//     slope_deg: 5                 # → incline_deg { pitch: 5, roll: 0 }
//     friction_static: 0.9         # → material.staticFriction
//     friction_kinetic: 0.7        # → material.kineticFriction
//     stribeck_velocity: 0.02      # → material.stribeckVelocity_mps
//     patches:                     # rect [xmin, ymin, xmax, ymax] + flat friction fields
//       - { name: ice, rect: [2, -1, 3, 1], friction_static: 0.1, friction_kinetic: 0.05 }
//   commands:   [{ t: 0, gait: stand }, { t: 1, gait: trot, vx: 0.4, vy: 0, yaw_rate: 0 }]
//   pushes:     [{ t: 4, duration: 0.1, fx: 0, fy: 80, fz: 0 }]   # rect pulse at the trunk centre
//   limits:     { must_not_fall: true, max_slip: 0.05 }           # → acceptance

import { defaultPhysicsStep_s } from './defaults.js';
import { isRecord } from '../files/source.js';
import { pointerJoin } from '../files/issue.js';

export const CURRENT_SCENARIO_VERSION = 1;
export const CURRENT_ROBOT_VERSION = 1;
export const OLDEST_SCENARIO_VERSION = 0;

/** Records field moves of one step: `moved(oldPointer, newPointer)`. */
export interface MigrationContext {
  moved(fromOld: string, toNew: string): void;
}

/** Migrates data of version `from` to `from + 1`. Must tolerate malformed input (leave it for the validator). */
export type MigrationStep = (data: Record<string, unknown>, ctx: MigrationContext) => Record<string, unknown>;

/** Maps pointers in migrated data back to the pointers of the original file. */
export class PathMap {
  private readonly steps: [string, string][][] = [];
  beginStep(): MigrationContext {
    const moves: [string, string][] = [];
    this.steps.push(moves);
    return { moved: (fromOld, toNew) => moves.push([fromOld, toNew]) };
  }
  toSource(pointer: string): string {
    let p = pointer;
    for (let s = this.steps.length - 1; s >= 0; s--) {
      let best: [string, string] | undefined;
      for (const move of this.steps[s]) {
        if (isPrefix(move[1], p) && (!best || move[1].length > best[1].length)) best = move;
      }
      if (best) p = best[0] + p.slice(best[1].length);
    }
    return p;
  }
}

function isPrefix(prefix: string, pointer: string): boolean {
  return pointer === prefix || pointer.startsWith(prefix + '/');
}

/** Moves `data[from]` to `target[to]` when present, recording the move. */
function move(
  data: Record<string, unknown>,
  from: string,
  target: Record<string, unknown>,
  to: string,
  ctx: MigrationContext,
  fromBase: string,
  toBase: string,
): void {
  if (!(from in data)) return;
  target[to] = data[from];
  delete data[from];
  ctx.moved(pointerJoin(fromBase, from), pointerJoin(toBase, to));
}

export function migrateV0toV1(input: Record<string, unknown>, ctx: MigrationContext): Record<string, unknown> {
  const d: Record<string, unknown> = { ...input };
  const out: Record<string, unknown> = {};
  // Keep fields whose name did not change at the same place (in their original order).
  for (const key of ['$schema', 'format', 'title', 'description', 'tags', 'robot', 'seed', 'sensing']) {
    if (key in d) {
      out[key] = d[key];
      delete d[key];
    }
  }
  out.formatVersion = 1;
  delete d.formatVersion;
  move(d, 'name', out, 'id', ctx, '', '');
  if (!('revision' in d)) out.revision = 1;

  const dt = d.dt;
  if ('dt' in d) {
    out.physics = { step_s: dt };
    ctx.moved('/dt', '/physics/step_s');
    delete d.dt;
  }
  if ('steps' in d) {
    const steps = d.steps;
    const step_s = typeof dt === 'number' ? dt : defaultPhysicsStep_s();
    // Rounded to 12 significant digits so 16000 × 0.0005 reads 8, not 8.000000000000002.
    out.duration_s = typeof steps === 'number' ? Number((steps * step_s).toPrecision(12)) : steps;
    ctx.moved('/steps', '/duration_s');
    delete d.steps;
  }
  if ('start_height' in d) {
    const h = d.start_height;
    out.initial = { position_m: [0, 0, h] };
    ctx.moved('/start_height', '/initial/position_m/2');
    delete d.start_height;
  }

  if ('ground' in d) {
    const g = d.ground;
    delete d.ground;
    if (isRecord(g)) {
      const gin: Record<string, unknown> = { ...g };
      const gout: Record<string, unknown> = {};
      if ('slope_deg' in gin) {
        gout.incline_deg = { pitch: gin.slope_deg, roll: 0 };
        ctx.moved('/ground/slope_deg', '/ground/incline_deg/pitch');
        delete gin.slope_deg;
      }
      const material = flatFriction(gin, ctx, '/ground', '/ground/material');
      if (Object.keys(material).length > 0) gout.material = material;
      if ('patches' in gin) {
        const patches = gin.patches;
        delete gin.patches;
        gout.patches = Array.isArray(patches)
          ? patches.map((p, i) => migratePatchV0(p, ctx, `/ground/patches/${i}`))
          : patches;
        ctx.moved('/ground/patches', '/ground/patches');
      }
      Object.assign(gout, gin); // anything unknown stays for the validator to report
      out.ground = gout;
    } else {
      out.ground = g;
    }
  }

  if ('commands' in d) {
    const commands = d.commands;
    delete d.commands;
    out.commands = Array.isArray(commands)
      ? commands.map((c, i) => {
          if (!isRecord(c)) return c;
          const cin = { ...c };
          const base = `/commands/${i}`;
          const cout: Record<string, unknown> = {};
          move(cin, 't', cout, 'at_s', ctx, base, base);
          move(cin, 'gait', cout, 'gait', ctx, base, base);
          if ('vx' in cin || 'vy' in cin) {
            cout.velocity_mps = [cin.vx ?? 0, cin.vy ?? 0, 0];
            ctx.moved(pointerJoin(base, 'vx'), pointerJoin(base, 'velocity_mps', 0));
            ctx.moved(pointerJoin(base, 'vy'), pointerJoin(base, 'velocity_mps', 1));
            delete cin.vx;
            delete cin.vy;
          }
          move(cin, 'yaw_rate', cout, 'yawRate_radps', ctx, base, base);
          return Object.assign(cout, cin);
        })
      : commands;
  }

  if ('pushes' in d) {
    const pushes = d.pushes;
    delete d.pushes;
    out.pushes = Array.isArray(pushes)
      ? pushes.map((p, i) => {
          if (!isRecord(p)) return p;
          const pin = { ...p };
          const base = `/pushes/${i}`;
          const pout: Record<string, unknown> = {};
          move(pin, 't', pout, 'at_s', ctx, base, base);
          move(pin, 'duration', pout, 'duration_s', ctx, base, base);
          if ('fx' in pin || 'fy' in pin || 'fz' in pin) {
            pout.force_N = [pin.fx ?? 0, pin.fy ?? 0, pin.fz ?? 0];
            (['fx', 'fy', 'fz'] as const).forEach((k, axis) => ctx.moved(pointerJoin(base, k), pointerJoin(base, 'force_N', axis)));
            delete pin.fx;
            delete pin.fy;
            delete pin.fz;
          }
          pout.shape = 'rect';
          return Object.assign(pout, pin);
        })
      : pushes;
  }

  if ('limits' in d) {
    const limits = d.limits;
    delete d.limits;
    if (isRecord(limits)) {
      const lin = { ...limits };
      const lout: Record<string, unknown> = {};
      ctx.moved('/limits', '/acceptance');
      move(lin, 'must_not_fall', lout, 'mustNotFall', ctx, '/limits', '/acceptance');
      move(lin, 'max_slip', lout, 'maxSlipDistance_m', ctx, '/limits', '/acceptance');
      out.acceptance = Object.assign(lout, lin);
    } else {
      out.acceptance = limits;
      ctx.moved('/limits', '/acceptance');
    }
  }
  return Object.assign(out, d);
}

function flatFriction(src: Record<string, unknown>, ctx: MigrationContext, fromBase: string, toBase: string): Record<string, unknown> {
  const material: Record<string, unknown> = {};
  move(src, 'friction_static', material, 'staticFriction', ctx, fromBase, toBase);
  move(src, 'friction_kinetic', material, 'kineticFriction', ctx, fromBase, toBase);
  move(src, 'stribeck_velocity', material, 'stribeckVelocity_mps', ctx, fromBase, toBase);
  return material;
}

function migratePatchV0(p: unknown, ctx: MigrationContext, base: string): unknown {
  if (!isRecord(p)) return p;
  const pin = { ...p };
  const pout: Record<string, unknown> = {};
  move(pin, 'name', pout, 'name', ctx, base, base);
  if ('rect' in pin) {
    const r = pin.rect;
    delete pin.rect;
    if (Array.isArray(r) && r.length === 4) {
      pout.rect = { min_m: [r[0], r[1]], max_m: [r[2], r[3]] };
      ctx.moved(pointerJoin(base, 'rect', 0), pointerJoin(base, 'rect', 'min_m', 0));
      ctx.moved(pointerJoin(base, 'rect', 1), pointerJoin(base, 'rect', 'min_m', 1));
      ctx.moved(pointerJoin(base, 'rect', 2), pointerJoin(base, 'rect', 'max_m', 0));
      ctx.moved(pointerJoin(base, 'rect', 3), pointerJoin(base, 'rect', 'max_m', 1));
    } else {
      pout.rect = r;
    }
    ctx.moved(pointerJoin(base, 'rect'), pointerJoin(base, 'rect'));
  }
  pout.material = flatFriction(pin, ctx, base, pointerJoin(base, 'material'));
  ctx.moved(base, base);
  return Object.assign(pout, pin);
}

/** The migration table: key = version migrated from. */
export const SCENARIO_MIGRATIONS: Readonly<Record<number, MigrationStep>> = Object.freeze({
  0: migrateV0toV1,
});

export type MigrationOutcome =
  | { ok: true; data: Record<string, unknown>; paths: PathMap; from: number }
  | { ok: false; message: string };

/** Runs the table from `version` up to CURRENT_SCENARIO_VERSION. */
export function migrateScenario(data: Record<string, unknown>, version: number): MigrationOutcome {
  const paths = new PathMap();
  if (version > CURRENT_SCENARIO_VERSION) {
    return {
      ok: false,
      message: `the file is format version ${version}, but this Footing knows scenario format versions ${OLDEST_SCENARIO_VERSION} to ${CURRENT_SCENARIO_VERSION}; update Footing to read it`,
    };
  }
  if (version < OLDEST_SCENARIO_VERSION) {
    return { ok: false, message: `format version ${version} never existed (expected ${OLDEST_SCENARIO_VERSION} to ${CURRENT_SCENARIO_VERSION})` };
  }
  let current = data;
  for (let v = version; v < CURRENT_SCENARIO_VERSION; v++) {
    const step = SCENARIO_MIGRATIONS[v];
    if (!step) return { ok: false, message: `no migration from format version ${v} to ${v + 1}` };
    current = step(current, paths.beginStep());
  }
  return { ok: true, data: current, paths, from: version };
}
