// What the bench measures when not told otherwise: the bundled scenario and the standard builds.
// `footing bench` and `footing run --bench` both use these.

import { execFileSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, renameSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { DEFAULT_BUILDS, parseBuildSpec, type BuildSpec } from '../builds/spec.js';

/** The repository root (where scenarios/ and examples/ live). */
const PACKAGE_ROOT = fileURLToPath(new URL('../../', import.meta.url));

/** The bundled default scenario: flat, dry, stand → trot → stand, so every code path runs. */
export const DEFAULT_BENCH_SCENARIO = path.join(PACKAGE_ROOT, 'scenarios', 'dry-baseline-walk.yaml');

/**
 * The standard set `npm run bench` measures: four reference builds, the Python example and, where
 * g++ is on PATH, the C++ example (so the bench reports the f64 protocol's overhead with a
 * compiled build, whose own compute is sub-microsecond).
 */
export function defaultBenchBuilds(): BuildSpec[] {
  const python = path.join(PACKAGE_ROOT, 'examples', 'python', 'stand_controller.py');
  const cpp = compiledCppExample();
  return [
    ...DEFAULT_BUILDS.map((text) => parseBuildSpec(text, PACKAGE_ROOT)),
    parseBuildSpec(`stand-py=exec:python3 ${JSON.stringify(python)}`, PACKAGE_ROOT),
    ...(cpp ? [parseBuildSpec(`stand-cpp=exec:${JSON.stringify(cpp)}`, PACKAGE_ROOT)] : []),
  ];
}

/**
 * examples/cpp/stand_controller.cpp compiled with the plain g++ line of its header, kept in the
 * temporary folder under the hash of its sources (compiled once per change); null without g++.
 */
export function compiledCppExample(): string | null {
  const folder = path.join(PACKAGE_ROOT, 'examples', 'cpp');
  const sources = ['stand_controller.cpp', 'footing_stdio.hpp'].map((file) => path.join(folder, file));
  if (!sources.every((file) => existsSync(file))) return null;
  const hash = createHash('sha256');
  for (const file of sources) hash.update(readFileSync(file));
  const dir = path.join(tmpdir(), `footing-cpp-example-${hash.digest('hex').slice(0, 16)}`);
  const program = path.join(dir, 'stand_controller');
  if (existsSync(program)) return program;
  mkdirSync(dir, { recursive: true });
  const partial = `${program}.${process.pid}.tmp`;
  try {
    execFileSync('g++', ['-std=c++17', '-O2', '-ffp-contract=off', '-o', partial, sources[0]], { stdio: 'pipe' });
  } catch {
    return null;
  }
  renameSync(partial, program);
  return program;
}
