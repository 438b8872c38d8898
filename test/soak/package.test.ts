// Footing as a controller team adds it (README "Add Footing to your controller repository"):
// `npm pack` → a fresh repository WITHOUT "type": "module" installs the tarball as a dev
// dependency → a .ts build importing its types from 'footing' type-checks and runs →
// ci/merge-gate.sh gives 0 (gate holds), 1 (the candidate breaks) and 2 (bad input). In the soak
// suite: the install resolves the dependencies from the npm registry (they are not all in the
// local npm cache, so `npm i --offline` fails), which takes seconds and needs the registry.

import { execFileSync, spawnSync } from 'node:child_process';
import { cpSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';

const ROOT = path.resolve(import.meta.dirname, '../..');
const TSC = path.join(ROOT, 'node_modules/typescript/bin/tsc');
let work: string;
let repo: string;

const CONFIG = (candidate: string) => `suites:
  merge:
    scenarios: [scenarios]
    builds: [main, candidate]
    baseline: main
builds:
  main: controller/stand.ts
  candidate: ${candidate}
out: out/footing
`;

function gate(): { status: number | null; text: string } {
  const result = spawnSync('bash', ['node_modules/footing/ci/merge-gate.sh'], { cwd: repo, encoding: 'utf8' });
  return { status: result.status, text: `${result.stdout}\n${result.stderr}` };
}

beforeAll(() => {
  work = mkdtempSync(path.join(tmpdir(), 'footing-package-'));
  const packed = JSON.parse(execFileSync('npm', ['pack', '--json', '--pack-destination', work], { cwd: ROOT, encoding: 'utf8' })) as { filename: string }[];
  repo = path.join(work, 'controller-repo');
  mkdirSync(path.join(repo, 'controller'), { recursive: true });
  // A CommonJS package (no "type"), as most repositories are.
  writeFileSync(path.join(repo, 'package.json'), JSON.stringify({ name: 'my-controller', version: '1.0.0' }, null, 2));
  execFileSync('git', ['init', '-q'], { cwd: repo });
  execFileSync('npm', ['i', '-D', '--prefer-offline', '--no-audit', '--no-fund', path.join(work, packed[0].filename)], { cwd: repo, stdio: 'pipe' });
  cpSync(path.join(ROOT, 'examples/typescript/stand_controller.ts'), path.join(repo, 'controller/stand.ts'));
  writeFileSync(
    path.join(repo, 'controller/broken.ts'),
    `import type { Controller, ControllerSetup } from 'footing';
export function createController(setup: ControllerSetup): Controller {
  return { telemetryNames: [], tick() { throw new Error('broken on purpose: ' + setup.controlRate_Hz); } };
}
`,
  );
  mkdirSync(path.join(repo, 'scenarios'));
  cpSync(path.join(ROOT, 'scenarios/robots'), path.join(repo, 'scenarios/robots'), { recursive: true });
  // The near-limit ramp's standing phase on level ground (the example stands there within
  // acceptance): its later commands (walk across, stop) dropped, shortened to keep this test modest.
  const stand = readFileSync(path.join(ROOT, 'scenarios/ramp-stand-near-limit.yaml'), 'utf8')
    .replace(/^ {2}- \{ at_s: (?!0,).*\n/gm, '')
    .replace(/^duration_s: .*$/m, 'duration_s: 1.5')
    .replace(/pitch: 12/, 'pitch: 0');
  writeFileSync(path.join(repo, 'scenarios/stand.yaml'), stand);
}, 300_000);

afterAll(() => {
  if (work) rmSync(work, { recursive: true, force: true });
});

describe('the packed package in a controller repository without "type": "module"', () => {
  it.each([
    ['NodeNext', 'NodeNext'],
    ['commonjs', 'node10'],
    ['ESNext', 'bundler'],
  ])('declares its build types: a strict type-check (module %s, resolution %s) of the example build passes', (module, moduleResolution) => {
    writeFileSync(
      path.join(repo, 'tsconfig.json'),
      JSON.stringify({ compilerOptions: { strict: true, target: 'ES2022', module, moduleResolution, noEmit: true, skipLibCheck: true, types: [] }, include: ['controller/**/*.ts'] }),
    );
    const result = spawnSync(process.execPath, [TSC, '-p', 'tsconfig.json'], { cwd: repo, encoding: 'utf8' });
    expect(result.stdout + result.stderr).toBe('');
    expect(result.status).toBe(0);
  });

  it('npx --no-install footing runs and names its version', () => {
    const version = execFileSync('npx', ['--no-install', 'footing', '--version'], { cwd: repo, encoding: 'utf8' }).trim();
    expect(version).toBe(JSON.parse(readFileSync(path.join(ROOT, 'package.json'), 'utf8')).version);
  });

  it('the C++ example from the package compiles there and runs beside the .ts build, both passing', () => {
    mkdirSync(path.join(repo, 'build'), { recursive: true });
    execFileSync('g++', ['-std=c++17', '-O2', '-ffp-contract=off', '-o', 'build/stand_controller', 'node_modules/footing/examples/cpp/stand_controller.cpp'], { cwd: repo, stdio: 'pipe' });
    const result = spawnSync('npx', ['--no-install', 'footing', 'run', 'scenarios', '--build', 'cpp=exec:build/stand_controller', '--build', 'ts=controller/stand.ts', '--out', 'out/cpp'], { cwd: repo, encoding: 'utf8' });
    expect(result.stderr).toContain('2 runs: 2 pass, 0 fail, 0 error');
    expect(result.status).toBe(0);
    const results = JSON.parse(readFileSync(path.join(repo, 'out/cpp/results.json'), 'utf8')) as { runs: { build: string; telemetry: { name: string; min: number; max: number }[] }[] };
    // The same arithmetic on the same observations: the same telemetry extremes, bit for bit.
    const [cpp, ts] = ['cpp', 'ts'].map((name) => results.runs.find((run) => run.build === name)?.telemetry);
    expect(cpp).toEqual(ts);
  });

  it('ci/merge-gate.sh holds (exit 0) for a candidate equal to the baseline, both .ts builds run', () => {
    writeFileSync(path.join(repo, 'footing.config.yaml'), CONFIG('controller/stand.ts'));
    const { status, text } = gate();
    expect(text).toContain('footing merge gate: holds');
    expect(text).not.toMatch(/error\s+ramp-stand/);
    expect(status).toBe(0);
  });

  it('ci/merge-gate.sh blocks (exit 1) when the candidate build throws', () => {
    writeFileSync(path.join(repo, 'footing.config.yaml'), CONFIG('controller/broken.ts'));
    const { status, text } = gate();
    expect(text).toContain('broken on purpose');
    expect(text).toContain('footing merge gate: BLOCKS the merge');
    expect(status).toBe(1);
  });

  it('ci/merge-gate.sh says bad input (exit 2) for a config key that does not exist', () => {
    writeFileSync(path.join(repo, 'footing.config.yaml'), `${CONFIG('controller/stand.ts')}jbos: 2\n`);
    const { status, text } = gate();
    expect(text).toContain('footing merge gate: bad input');
    expect(status).toBe(2);
  });
});
