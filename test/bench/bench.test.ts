// Smoke test of the bench: a tiny time budget on a shortened scenario. It checks that every figure
// is a finite positive number, that the JSON validates against bench.schema.json, and that the
// figures attach to results.json and feed the gate rule — never how fast anything is.

import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { attachBench } from '../../harness/bench/attach.js';
import { DEFAULT_BENCH_SCENARIO } from '../../harness/bench/defaults.js';
import { runBenchCommand } from '../../harness/commands/bench.js';
import { runBench } from '../../harness/bench/run.js';
import { renderBenchTable } from '../../harness/bench/table.js';
import type { BenchReport } from '../../harness/bench/types.js';
import { validateBench } from '../../harness/bench/validate.js';
import { parseBuildSpec } from '../../harness/builds/spec.js';
import { governorRateRows } from '../../harness/gate/governorRate.js';
import { createResultsFile } from '../../harness/results/runResult.js';
import { validateResults } from '../../harness/results/validate.js';
import { loadScenarioFile } from '../../harness/scenario/load.js';
import type { ResolvedScenario } from '../../harness/scenario/types.js';

const ROOT = path.resolve(__dirname, '../..');
const PYTHON_EXAMPLE = path.join(ROOT, 'examples/python/stand_controller.py');

function hasPython(): boolean {
  try {
    execFileSync('python3', ['--version'], { stdio: 'ignore' });
    return true;
  } catch {
    return false;
  }
}

/** The default scenario cut to its first 1.3 s: stand, then the start of the trot. */
async function shortScenario(): Promise<ResolvedScenario> {
  const loaded = await loadScenarioFile(DEFAULT_BENCH_SCENARIO);
  if (!loaded.ok) throw new Error(loaded.errors.map((e) => e.message).join('; '));
  return { ...loaded.scenarios[0], duration_s: 1.3 };
}

function expectPositiveFinite(value: unknown, where: string): void {
  expect(typeof value, where).toBe('number');
  expect(Number.isFinite(value as number) && (value as number) > 0, `${where} = ${String(value)}`).toBe(true);
}

describe('footing bench (smoke, tiny budget)', () => {
  let report: BenchReport;
  const python = hasPython();

  beforeAll(async () => {
    const builds = [parseBuildSpec('ref:governed', ROOT), parseBuildSpec('ref:nominal', ROOT)];
    if (python) builds.push(parseBuildSpec(`stand-py=exec:python3 ${PYTHON_EXAMPLE}`, ROOT));
    report = await runBench({ scenario: await shortScenario(), builds, time_ms: 2 });
  }, 60_000);

  it('measures every build without failures and the figures are finite and positive', () => {
    expect(report.failures).toEqual([]);
    expectPositiveFinite(report.plant.stepsPerSecond, 'plant.stepsPerSecond');
    expectPositiveFinite(report.plant.realTimeFactor, 'plant.realTimeFactor');
    expect(report.plant.allFeetInContact).toBe(true);
    for (const build of report.builds) {
      expectPositiveFinite(build.ticksPerSecond, `${build.name}.ticksPerSecond`);
      expectPositiveFinite(build.realTimeFactor, `${build.name}.realTimeFactor`);
      expectPositiveFinite(build.tick.p99_us, `${build.name}.tick.p99_us`);
      expect(build.closedLoop.simulated_s).toBeCloseTo(1.3, 9);
      expect(build.recordedObservations).toBe(1300); // one per 1 kHz tick of the 1.3 s run
    }
  });

  it('times the governor only for the build that has one, fed the recorded run', () => {
    const governed = report.builds.find((b) => b.name === 'governed');
    expectPositiveFinite(governed?.governor?.updatesPerSecond, 'governed.governor.updatesPerSecond');
    expect(report.builds.find((b) => b.name === 'nominal')?.governor).toBeUndefined();
  });

  it.runIf(python)('measures the process build’s protocol overhead', () => {
    const py = report.builds.find((b) => b.name === 'stand-py');
    expect(py?.kind).toBe('process');
    expect(py?.protocolOverhead?.samples).toBeGreaterThan(0);
    expect(Number.isFinite(py?.protocolOverhead?.mean_us)).toBe(true);
    expectPositiveFinite(py?.protocolOverhead?.reportedCompute_mean_us, 'reported compute');
  });

  it('writes JSON that validates against bench.schema.json, and the schema refuses a broken copy', () => {
    const parsed: unknown = JSON.parse(JSON.stringify(report));
    expect(validateBench(parsed)).toMatchObject({ ok: true });
    const broken = JSON.parse(JSON.stringify(report)) as { builds: { ticksPerSecond: unknown }[] };
    broken.builds[0].ticksPerSecond = -1;
    const outcome = validateBench(broken);
    expect(outcome.ok).toBe(false);
    if (!outcome.ok) expect(outcome.issues.join('\n')).toMatch(/\/builds\/0\/ticksPerSecond/);
  });

  it('prints one table row per figure', () => {
    const text = renderBenchTable(report).join('\n');
    expect(text).toMatch(/plant\.step \(4 feet in contact\)/);
    expect(text).toMatch(/governed governor update/);
    expect(text).toMatch(/nominal closed loop/);
    expect(text).not.toMatch(/nominal governor update/);
  });

  it('attaches to results.json as the optional `bench` field, which still validates', () => {
    const results = attachBench(createResultsFile({ toolVersion: report.toolVersion, builds: [{ name: 'governed' }] }), report);
    expect(validateResults(JSON.parse(JSON.stringify(results)))).toMatchObject({ ok: true });
    expect(results.bench?.builds.length).toBe(report.builds.length);
  });
});

describe('footing bench command', () => {
  it('refuses a non-positive --time-ms and a bad build spec with exit code 2', async () => {
    expect((await runBenchCommand({ builds: ['ref:governed'], time_ms: 0 })).exitCode).toBe(2);
    const bad = await runBenchCommand({ builds: ['ref:nosuch'], time_ms: 1 });
    expect(bad.exitCode).toBe(2);
    expect(bad.lines.join('\n')).toMatch(/unknown reference build 'nosuch'/);
  });

  it('benches the default scenario and writes the JSON file', async () => {
    const dir = mkdtempSync(path.join(tmpdir(), 'footing-bench-'));
    const json = path.join(dir, 'bench.json');
    const outcome = await runBenchCommand({ builds: ['ref:clamped'], time_ms: 1, json });
    expect(outcome.exitCode, outcome.lines.join('\n')).toBe(0);
    const written = validateBench(JSON.parse(readFileSync(json, 'utf8')));
    expect(written.ok).toBe(true);
    if (written.ok) expect(written.value.scenario.id).toBe('dry-baseline-walk');
  }, 60_000);
});

describe('gate rule: governor update rate', () => {
  const bench = (rate: number) => ({
    bench: { format: 'footing-bench' as const, formatVersion: 1, scenario: { id: 's' }, machine: { cpuModel: 'm', cores: 2 }, builds: [{ name: 'b', governor: { updatesPerSecond: rate } }] },
  });

  it('breaks when the rate drops by more than governorRateDrop and holds within it', () => {
    // 1e6 → 6.5e5 is a 35 % drop, over the default 30 %; 1e6 → 7.5e5 (25 %) is within it.
    const [broken] = governorRateRows(bench(1e6), bench(6.5e5), [['b', 'b']], { governorRateDrop: 0.3 });
    expect(broken.broken).toBe(true);
    expect(broken.reason).toMatch(/fell from 1000000 to 650000 per second \(−35 %\)/);
    const [held] = governorRateRows(bench(1e6), bench(7.5e5), [['b', 'b']], { governorRateDrop: 0.3 });
    expect(held.broken).toBe(false);
  });

  it('yields no row when either side was not measured', () => {
    expect(governorRateRows({}, bench(1e6), [['b', 'b']], { governorRateDrop: 0.3 })).toEqual([]);
  });
});
