// TypeScript build modules load whatever the consumer's package.json says (docs/protocol.md):
// .ts follows the nearest package.json "type" (CommonJS when absent), .mts is ESM, .cts CommonJS,
// in the caller's thread and in the thread of its own a module build runs in (isolated/).

import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { createAction, createObservation, type ControllerSetup } from '../../../harness/builds/interface.js';
import { loadModuleFactory, openBuild } from '../../../harness/builds/loader.js';
import { parseBuildSpec } from '../../../harness/builds/spec.js';
import { testRobot } from '../../support/robots.js';

const root = mkdtempSync(path.join(tmpdir(), 'footing-ts-modules-'));
afterAll(() => rmSync(root, { recursive: true, force: true }));

// A type-only import and an interface: what failed with "Unexpected identifier 'Setup'" when a
// CommonJS package's .ts reached Node's CommonJS loader untransformed.
const BUILD = `import type { Setup } from './setup';
export function createController(setup: Setup) {
  return { telemetryNames: ['probe.rate_Hz'], tick(_obs: unknown, action: { telemetry: Float64Array }) { action.telemetry[0] = setup.controlRate_Hz; } };
}
`;

function repository(type: 'commonjs' | 'module' | undefined): string {
  const dir = path.join(root, type ?? 'untyped');
  mkdirSync(dir, { recursive: true });
  writeFileSync(path.join(dir, 'package.json'), JSON.stringify(type ? { name: 'c', type } : { name: 'c' }));
  writeFileSync(path.join(dir, 'setup.ts'), 'export interface Setup { controlRate_Hz: number }\n');
  for (const ext of ['ts', 'mts', 'cts']) writeFileSync(path.join(dir, `build.${ext}`), BUILD);
  return dir;
}

const setup: ControllerSetup = { robot: testRobot(), controlRate_Hz: 500, physicsStep_s: 0.0005, gravity_mps2: [0, 0, -9.81], options: {} };

describe.each([undefined, 'commonjs', 'module'] as const)('a package with "type": %s', (type) => {
  const dir = repository(type);
  it.each(['ts', 'mts', 'cts'])('loads build.%s in this thread and in a build thread', async (ext) => {
    const spec = parseBuildSpec(`probe=${path.join(dir, `build.${ext}`)}`, dir);
    const factory = await loadModuleFactory(spec);
    expect(typeof factory).toBe('function');
    const n = setup.robot.hips_m.length;
    const build = await openBuild(spec, setup, { isolation: 'thread' });
    try {
      expect(build.telemetryNames).toEqual(['probe.rate_Hz']);
      const action = createAction(n, 1);
      const pending = build.tick(createObservation(n), action);
      if (pending) await pending;
      expect(action.telemetry[0]).toBe(500);
    } finally {
      await build.close();
    }
  });
});
