// Build telemetry recorded (docs/protocol.md: "named scalars the build wants recorded"): every
// name of Controller.telemetryNames goes into the plot series (per-bucket min/max), the trace CSV
// (one column each, after the others) and results.json (the run's exact min/max), end to end
// through `footing run` with the TypeScript example, whose telemetry is a known function of the
// trunk state: stand.heightError_m = standingHeight_m − trunk z.

import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { parse } from 'csv-parse/sync';
import { describe, expect, it } from 'vitest';
import { EXIT } from '../../../harness/commands/exit.js';
import { runSuite } from '../../../harness/commands/run.js';
import type { ResultsFile } from '../../../harness/results/types.js';
import { validateResults } from '../../../harness/results/validate.js';
import { seriesPath } from '../../../harness/score/series/file.js';
import type { RunSeries } from '../../../harness/score/series/types.js';
import { validateSeries } from '../../../harness/score/series/validate.js';

const SCENARIO = 'test/run/fixtures/mini/short-stand.yaml';
const STANDING_HEIGHT_m = 0.3; // test/run/fixtures/mini/robots/quad-24kg.yaml standingHeight_m

describe('telemetry of a build, recorded', async () => {
  const out = mkdtempSync(path.join(tmpdir(), 'footing-telemetry-'));
  const outcome = await runSuite({ paths: [SCENARIO], builds: ['stand=examples/typescript/stand_controller.ts'], outDir: out, trace: true, jobs: 1, quiet: true });
  const results = JSON.parse(readFileSync(path.join(out, 'results.json'), 'utf8')) as ResultsFile;
  const run = results.runs[0];
  const rows = parse(readFileSync(path.join(out, run.trace as string), 'utf8'), { columns: true, cast: true }) as Record<string, number>[];
  const series = JSON.parse(readFileSync(path.join(out, seriesPath(run.scenario.id, run.build)), 'utf8')) as RunSeries;

  it('the run ran and the files are valid', () => {
    expect(outcome.exitCode).not.toBe(EXIT.badInput);
    expect(run.status).not.toBe('error');
    expect(validateResults(results).ok).toBe(true);
    expect(validateSeries(series).ok).toBe(true);
  });

  it('the trace has one column per name after every other column, each tick the value the build wrote', () => {
    const header = Object.keys(rows[0]);
    expect(header.slice(-2)).toEqual(['telemetry.stand.heightError_m', 'telemetry.stand.tiltError']);
    expect(header.indexOf('t_s')).toBe(0);
    // A row holds the state after the tick's physics, the telemetry what the build computed from
    // the observation before it: the previous row's state (at the trace's 1 µm).
    for (let k = 1; k < rows.length; k++) {
      expect(rows[k]['telemetry.stand.heightError_m']).toBeCloseTo(STANDING_HEIGHT_m - rows[k - 1].base_z_m, 5);
      expect(rows[k]['telemetry.stand.tiltError']).toBeGreaterThanOrEqual(0);
    }
  });

  it('results.json holds each name\'s exact min and max over the run (those of the full-precision trace column)', () => {
    expect(run.telemetry?.map((t) => t.name)).toEqual(['stand.heightError_m', 'stand.tiltError']);
    for (const range of run.telemetry ?? []) {
      const column = rows.map((row) => row[`telemetry.${range.name}`]);
      expect(range.min).toBe(Math.min(...column));
      expect(range.max).toBe(Math.max(...column));
    }
    expect((run.telemetry?.[0].max as number) - (run.telemetry?.[0].min as number)).toBeGreaterThan(0);
  });

  it('the plot series holds every name, per-bucket extremes within the run\'s, and the run\'s extremes', () => {
    expect(series.telemetry?.map((t) => t.name)).toEqual(['stand.heightError_m', 'stand.tiltError']);
    expect(series.dropped.telemetry).toBe(0);
    for (const [k, t] of (series.telemetry ?? []).entries()) {
      expect(t.values.min).toHaveLength(series.t_s.length);
      expect(t.min).toBe(run.telemetry?.[k].min);
      expect(t.max).toBe(run.telemetry?.[k].max);
      const mins = t.values.min.filter((v): v is number => v !== null);
      const maxs = t.values.max.filter((v): v is number => v !== null);
      // 6 significant digits: the bucket extremes bracket the run's to that rounding.
      expect(Math.min(...mins)).toBeCloseTo(t.min as number, 5);
      expect(Math.max(...maxs)).toBeCloseTo(t.max as number, 5);
    }
  });
});

describe('trace telemetry columns', () => {
  it('quote a name holding a comma or quote (RFC 4180), which a CSV parser reads back', async () => {
    const { createTraceWriter } = await import('../../../harness/results/trace.js');
    const { createTickSample } = await import('../../../harness/score/sample.js');
    const file = path.join(mkdtempSync(path.join(tmpdir(), 'footing-trace-names-')), 'trace.csv');
    const writer = createTraceWriter(file, 4, 10, { telemetryNames: ['plain', 'a,b', 'say "hi"'] });
    writer.writeRow(createTickSample(4), [1.5, -0.1, 1e-300]);
    writer.close();
    const [row] = parse(readFileSync(file, 'utf8'), { columns: true }) as Record<string, string>[];
    expect(row['telemetry.plain']).toBe('1.5');
    expect(row['telemetry.a,b']).toBe('-0.1');
    expect(Number(row['telemetry.say "hi"'])).toBe(1e-300);
  });
});
