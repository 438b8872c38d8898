// The Python and C++ examples spin on their stdin for FOOTING_SPIN_US before sleeping in
// select()/poll(). Whether either side spins, they answer every tick with the same actions: the
// spin changes how a side waits, never what it reads.

import { describe, expect, it } from 'vitest';
import { compiledCppExample } from '../../../harness/bench/defaults.js';
import type { Action } from '../../../harness/builds/interface.js';
import { BuildFailure, openBuild } from '../../../harness/builds/loader.js';
import { parseBuildSpec } from '../../../harness/builds/spec.js';
import { REPO_ROOT, isAlive, syntheticActions, testSetup } from './helpers.js';

const TICKS = 100;
/** Harness window × the build's window (µs): neither, each alone, both. */
const COMBINATIONS = [
  { harness_us: 0, build_us: '0' },
  { harness_us: 100, build_us: '0' },
  { harness_us: 0, build_us: '100' },
  { harness_us: 100, build_us: '100' },
];

async function actionsOf(specText: string, harness_us: number, build_us: string): Promise<Action[]> {
  const build = await openBuild(parseBuildSpec(specText, REPO_ROOT), testSetup(), { spin_us: harness_us, env: { FOOTING_SPIN_US: build_us } });
  const actions = await syntheticActions(build, TICKS);
  const pid = build.pid as number;
  await build.close();
  expect(isAlive(pid)).toBe(false);
  return actions;
}

const cpp = compiledCppExample();
const examples = [
  { name: 'Python (f64)', spec: 'stand-py=exec:python3 examples/python/stand_controller.py' },
  { name: 'Python (json)', spec: 'stand-py=exec:python3 examples/python/stand_controller.py ?encoding=json' },
  ...(cpp ? [{ name: 'C++ (f64)', spec: `stand-cpp=exec:${JSON.stringify(cpp)}` }] : []),
];

describe('the examples with and without the spin on either side', () => {
  for (const { name, spec } of examples) {
    it(`the ${name} example answers ${TICKS} ticks identically in all four combinations`, async () => {
      const first = await actionsOf(spec, COMBINATIONS[0].harness_us, COMBINATIONS[0].build_us);
      for (const { harness_us, build_us } of COMBINATIONS.slice(1)) {
        const actions = await actionsOf(spec, harness_us, build_us);
        for (let k = 0; k < TICKS; k++) expect(actions[k], `tick ${k}, harness ${harness_us} µs, build ${build_us} µs`).toEqual(first[k]);
      }
    });
  }

  for (const { name, spec } of examples.filter((e) => !e.name.includes('json'))) {
    it(`the ${name} example given a FOOTING_SPIN_US it cannot use fails its start, naming the variable`, async () => {
      const failure = await actionsOf(spec, 0, 'soon').then(
        () => null,
        (error: unknown) => error,
      );
      expect(failure).toBeInstanceOf(BuildFailure);
      expect((failure as BuildFailure).reason).toBe('crash');
      expect((failure as BuildFailure).stderrTail).toMatch(/FOOTING_SPIN_US = 'soon': expected microseconds from 0 \(never spin\) to 10000/);
    });
  }
});
