import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parse as parseCsv } from 'csv-parse/sync';
import { XMLParser } from 'fast-xml-parser';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { readResultsFile, ResultsReadError } from '../../harness/results/read.js';
import { createTraceWriter, traceColumns, tracePath } from '../../harness/results/trace.js';
import { validateResults } from '../../harness/results/validate.js';
import { writeResultsJson } from '../../harness/results/writeJson.js';
import { renderJunitXml, writeJunitXml } from '../../harness/results/writeJunit.js';
import { renderSummaryMarkdown } from '../../harness/results/writeSummary.js';
import { loadedThreshold_N } from '../../harness/score/thresholds.js';
import { drive, makeScenario, standingSample } from '../score/fixtures.js';
import { sampleResults } from './fixtures.js';

let dir: string;
beforeEach(() => {
  dir = mkdtempSync(join(tmpdir(), 'footing-results-'));
});
afterEach(() => rmSync(dir, { recursive: true, force: true }));

describe('results.json', () => {
  it('scores the sample runs as expected (pass, pass, fail with reasons, error)', () => {
    const runs = sampleResults().runs;
    expect(runs.map((r) => r.status)).toEqual(['pass', 'pass', 'fail', 'error']);
    // 14 N on μs·f_n = 0.5·32 = 16 N → margin 1 − 14/16 = 0.125 < 0.2; 0.1 m/s for 1 s → 0.1 m.
    expect(runs[2].reasons).toEqual([
      'stance friction margin 0.13 < 0.20',
      'slip distance 0.10 m > 0.05 m',
      '1 commanded friction-cone violation > 0 allowed',
    ]);
  });

  it('writes a file that validates against results.schema.json and reads back equal', () => {
    const results = sampleResults();
    const file = join(dir, 'results.json');
    writeResultsJson(file, results);
    const onDisk = JSON.parse(readFileSync(file, 'utf8'));
    expect(validateResults(onDisk).ok).toBe(true);
    expect(readResultsFile(dir).results).toEqual(results);
    expect(readdirSync(dir)).toEqual(['results.json']); // no temporaries left behind
  });

  it('rejects invalid results with the JSON path of each problem', () => {
    const results = sampleResults() as unknown as { runs: Record<string, unknown>[] };
    (results.runs[0].metrics as Record<string, unknown>).slipDistance_m = -1;
    results.runs[1].status = 'maybe';
    delete results.runs[3].error;
    (results.runs[2].metrics as { frictionMargin: Record<string, unknown> }).frictionMargin.mean = 0.3;
    const validation = validateResults(results);
    expect(validation.ok).toBe(false);
    if (validation.ok) return;
    const text = validation.issues.map((i) => `${i.path}: ${i.message}`);
    expect(text).toContain('/runs/0/metrics/slipDistance_m: must be >= 0');
    expect(text.some((t) => t.startsWith('/runs/1/status:'))).toBe(true);
    expect(text).toContain('/runs/3: missing field "error"');
    expect(text).toContain('/runs/2/metrics/frictionMargin: unknown field "mean"');
    expect(() => writeResultsJson(join(dir, 'results.json'), results as never)).toThrow(/slipDistance_m/);
    expect(readdirSync(dir)).toEqual([]);
  });

  it('explains unreadable inputs by path', () => {
    expect(() => readResultsFile(join(dir, 'nope'))).toThrow(/no such file or folder/);
    expect(() => readResultsFile(dir)).toThrow(/folder holds no results.json/);
    writeResultsJson(join(dir, 'results.json'), sampleResults());
    const broken = join(dir, 'broken.json');
    rmSync(join(dir, 'results.json'));
    writeFileSync(broken, '{"format": "footing-results"');
    expect(() => readResultsFile(broken)).toThrow(ResultsReadError);
    expect(() => readResultsFile(broken)).toThrow(/not valid JSON/);
  });
});

describe('junit.xml', () => {
  it('parses back with one testsuite per build and one testcase per scenario', () => {
    const file = join(dir, 'junit.xml');
    writeJunitXml(file, sampleResults());
    const parser = new XMLParser({ ignoreAttributes: false, attributeNamePrefix: '', isArray: (name) => ['testsuite', 'testcase', 'property'].includes(name) });
    const xml = parser.parse(readFileSync(file, 'utf8'));
    const suites = xml.testsuites.testsuite;
    expect(xml.testsuites.tests).toBe('4');
    expect(xml.testsuites.failures).toBe('1');
    expect(xml.testsuites.errors).toBe('1');
    expect(suites.map((s: { name: string }) => s.name)).toEqual(['ref:governed', 'ref:trusting']);
    expect(suites[0].testcase.map((c: { name: string }) => c.name)).toEqual(['slippery-walk', 'quiet-stand']);
    expect(suites[0].testcase[0].failure).toBeUndefined();
    expect(suites[0].properties.property).toContainEqual({ name: 'commit', value: 'abc123' });
    const failed = suites[1].testcase[0];
    expect(failed.failure.message).toBe('stance friction margin 0.13 < 0.20; slip distance 0.10 m > 0.05 m; 1 commanded friction-cone violation > 0 allowed');
    expect(failed.failure.type).toBe('acceptance');
    const errored = suites[1].testcase[1];
    expect(errored.error.message).toBe('build process exited with code 3');
    expect(errored.error['#text']).toBe('panic: <boom> & "done"'); // escaped on write, restored on parse
    expect(errored['system-out']).toContain('no metrics');
    expect(suites[1].failures).toBe('1');
    expect(suites[1].errors).toBe('1');
  });

  it('escapes markup in titles', () => {
    expect(renderJunitXml(sampleResults())).toContain('Walk &lt;over&gt; &quot;ice&quot; &amp; | pipes');
  });
});

describe('summary.md', () => {
  it('totals per build and lists what did not pass with reasons', () => {
    const text = renderSummaryMarkdown(sampleResults());
    expect(text).toContain('### Footing: 4 runs — 2 pass, 1 fail, 1 error');
    expect(text).toContain('| ref:governed | 2 | 2 | 0 | 0 | 0.750 | 0.0000 | 0 |'); // 1 − 4/16 = 0.75
    expect(text).toContain('- `slippery-walk` × `ref:trusting` (fail): stance friction margin 0.13 \\< 0.20; slip distance 0.10 m \\> 0.05 m');
    expect(text).toContain('- `quiet-stand` × `ref:trusting` (error): error at 0.500 s: build process exited with code 3');
  });
});

describe('trace CSV', () => {
  it('streams the issue\'s columns with the scorer\'s loaded flag, appearing only on close', () => {
    const scenario = makeScenario();
    const threshold_N = loadedThreshold_N(scenario.plant.robot);
    const file = join(dir, tracePath('slippery-walk', 'ref:governed'));
    expect(file.endsWith('traces/slippery-walk__ref_governed.csv')).toBe(true);
    const writer = createTraceWriter(file, 4, threshold_N);
    drive(writer.writeRow, standingSample(), 5, (s, k) => {
      s.trunkPosition_m[0] = 0.001 * k;
      s.footForce_N.set([1.5, -2.25, k === 3 ? 6 : 32], 6); // foot 2 unloaded at tick 3 (6 N < 6.37 N)
      s.footVelocity_mps.set([0.1, 0, 0], 0);
      s.trunkQuaternion.set([Math.cos(0.05), 0, 0, Math.sin(0.05)]); // 0.1 rad of yaw
      s.trunkAngularVelocity_radps.set([0, 0, 0.25]);
      s.wantedForce_N.set([3, -1.5, 40], 3);
    });
    expect(readdirSync(join(dir, 'traces'))).toHaveLength(1);
    expect(readdirSync(join(dir, 'traces'))[0]).toMatch(/^\..*footing-tmp$/);
    writer.close();
    expect(readdirSync(join(dir, 'traces'))).toEqual(['slippery-walk__ref_governed.csv']);
    const rows: Record<string, string>[] = parseCsv(readFileSync(file, 'utf8'), { columns: true });
    expect(Object.keys(rows[0])).toEqual(traceColumns(4));
    expect(Object.keys(rows[0])).toHaveLength(14 + 4 * 13);
    expect(rows).toHaveLength(5);
    expect(Number(rows[2].t_s)).toBeCloseTo(0.003, 9);
    expect(Number(rows[2].base_x_m)).toBeCloseTo(0.002, 9);
    expect(Number(rows[0].foot0_vx_mps)).toBe(0.1);
    expect(Number(rows[0].foot2_fy_N)).toBe(-2.25);
    expect(Number(rows[0].foot2_mus)).toBe(0.5);
    expect(rows.map((r) => r.foot2_loaded)).toEqual(['1', '1', '1', '0', '1']);
    // Orientation to 1e-7, body rate, and the build's wanted force per foot.
    expect(Number(rows[1].base_qw)).toBeCloseTo(Math.cos(0.05), 7);
    expect(Number(rows[1].base_qz)).toBeCloseTo(Math.sin(0.05), 7);
    expect(Number(rows[1].base_wz_radps)).toBe(0.25);
    expect([rows[1].foot1_wanted_fx_N, rows[1].foot1_wanted_fy_N, rows[1].foot1_wanted_fz_N].map(Number)).toEqual([3, -1.5, 40]);
  });

  it('decimates and can be aborted without leaving a file', () => {
    const file = join(dir, 'trace.csv');
    const writer = createTraceWriter(file, 4, 1, { everyNth: 2 });
    drive(writer.writeRow, standingSample(), 5);
    writer.abort();
    expect(readdirSync(dir)).toEqual([]);
    const kept = createTraceWriter(file, 4, 1, { everyNth: 2 });
    drive(kept.writeRow, standingSample(), 5);
    kept.close();
    expect(readFileSync(file, 'utf8').trim().split('\n')).toHaveLength(1 + 3); // ticks 0, 2, 4
  });

  it('writes each telemetry value as String(value), repeated or changed, and every number as toFixed', () => {
    const file = join(dir, 'telemetry.csv');
    const writer = createTraceWriter(file, 4, 1, { telemetryNames: ['phase', 'gain'] });
    const series = [[0, 1.5], [0, 1.5], [-0, 0.1 + 0.2], [Number.NaN, 0.1 + 0.2], [Number.NaN, -1e-300], [7, -1e-300]];
    const sample = standingSample();
    series.forEach((values, k) => {
      sample.time_s = (k + 1) * 0.001;
      sample.trunkPosition_m[1] = -0.0000004 * k; // rounds to −0.000000, then −0.000001 …
      writer.writeRow(sample, Float64Array.from(values));
    });
    writer.close();
    const lines = readFileSync(file, 'utf8').trim().split('\n').slice(1);
    expect(lines.map((line) => line.split(',').slice(-2).join(','))).toEqual(series.map((values) => values.map(String).join(',')));
    expect(lines.map((line) => line.split(',')[2])).toEqual(series.map((_, k) => (-0.0000004 * k).toFixed(6)));
  });
});
