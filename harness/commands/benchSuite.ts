// The suite-scale figure: wall time and peak memory of N scenario-runs of 10 s simulated each,
// through the real runner (workers, scoring, series, result files). The scenarios are the bundled
// dry hall walk stretched to 10 s, one per seed, so every run does the same amount of work.

import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { DEFAULT_BUILDS } from '../builds/spec.js';
import { defaultJobs } from '../run/pool.js';
import { runSuite } from './run.js';

const LIBRARY = fileURLToPath(new URL('../../scenarios/', import.meta.url));

export interface SuiteBenchFigures {
  runs: number;
  simulatedPerRun_s: number;
  jobs: number;
  wall_s: number;
  /** Peak resident memory of the whole process (main thread and workers), MB. */
  peakRss_MB: number;
  passed: number;
}

export async function benchSuite(options: { runs: number; jobs?: number; log?: (line: string) => void }): Promise<SuiteBenchFigures> {
  const runs = Math.max(1, Math.floor(options.runs));
  const buildCount = Math.min(DEFAULT_BUILDS.length, runs);
  const scenarioCount = Math.ceil(runs / buildCount);
  const folder = mkdtempSync(path.join(tmpdir(), 'footing-suite-bench-'));
  try {
    writeFileSync(path.join(folder, 'robot.yaml'), readFileSync(path.join(LIBRARY, 'robots', 'quad-24kg.yaml')));
    const template = readFileSync(path.join(LIBRARY, 'dry-baseline-walk.yaml'), 'utf8')
      .replace(/^\$schema:.*\n/m, '')
      .replace(/^robot:.*$/m, 'robot: robot.yaml')
      .replace(/^duration_s:.*$/m, 'duration_s: 10');
    for (let k = 0; k < scenarioCount; k++) {
      const text = template.replace(/^id:.*$/m, `id: suite-bench-${k}`).replace(/^seed:.*$/m, `seed: ${k + 1}`);
      writeFileSync(path.join(folder, `suite-bench-${k}.yaml`), text);
    }
    const builds = DEFAULT_BUILDS.slice(0, buildCount).map((spec, i) => `b${i}=${spec}`);
    const started = performance.now();
    const outcome = await runSuite({ paths: [folder], builds, outDir: path.join(folder, 'out'), jobs: options.jobs, quiet: true, log: options.log });
    const wall_s = (performance.now() - started) / 1000;
    const all = outcome.results?.runs ?? [];
    return {
      runs: all.length,
      simulatedPerRun_s: 10,
      jobs: options.jobs ?? defaultJobs(),
      wall_s,
      peakRss_MB: process.resourceUsage().maxRSS / 1024,
      passed: all.filter((r) => r.status === 'pass').length,
    };
  } finally {
    rmSync(folder, { recursive: true, force: true });
  }
}

export function renderSuiteBench(f: SuiteBenchFigures): string[] {
  return [
    `suite: ${f.runs} runs × ${f.simulatedPerRun_s} s simulated on ${f.jobs} workers: ${f.wall_s.toFixed(1)} s wall (target ≤ 60 s for 200 runs), ` +
      `peak memory ${f.peakRss_MB.toFixed(0)} MB (target ≤ 300 MB); ${f.passed} of ${f.runs} runs passed`,
  ];
}
