// Crafted or damaged files under a results folder (series/*.json, results.json) never crash
// `footing report` or `footing merge` (a throw there is exit 3 with a stack): a bad series costs
// its own run its plots, a bad results file is bad input (exit 2), and the rest is still written.
import { cpSync, existsSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import fc from 'fast-check';
import { beforeAll, describe, expect, it } from 'vitest';
import { runReportCommand } from '../../harness/commands/report.js';
import { mergeResults } from '../../harness/commands/merge.js';
import { runSuite } from '../../harness/commands/run.js';

let base: string;

beforeAll(async () => {
  base = mkdtempSync(path.join(tmpdir(), 'footing-crafted-base-'));
  const outcome = await runSuite({ paths: ['test/run/fixtures/brief'], builds: ['ref:nominal', 'ref:governed'], outDir: base, jobs: 2, quiet: true });
  expect(outcome.results!.runs).toHaveLength(2);
}, 120_000);

type Json = null | boolean | number | string | Json[] | { [key: string]: Json };

type Slot = [Json[] | Record<string, Json>, string | number];

/**
 * Every (container, key) of a JSON value, grouped by its path with list indices collapsed
 * (`/feet/*​/stance/*`), so that a pick reaches every kind of field equally often, not mostly the
 * thousands of numbers of a long series.
 */
function slotGroups(value: Json, pointer = '', out = new Map<string, Slot[]>()): Map<string, Slot[]> {
  const add = (container: Json[] | Record<string, Json>, key: string | number, shape: string) => {
    const group = out.get(shape) ?? [];
    group.push([container, key]);
    out.set(shape, group);
  };
  if (Array.isArray(value)) value.forEach((item, i) => (add(value, i, `${pointer}/*`), slotGroups(item, `${pointer}/*`, out)));
  else if (value !== null && typeof value === 'object') for (const key of Object.keys(value)) (add(value, key, `${pointer}/${key}`), slotGroups(value[key], `${pointer}/${key}`, out));
  return out;
}

const mutation = fc.record({
  target: fc.constantFrom('series', 'results'),
  kind: fc.constantFrom('replace', 'replace', 'replace', 'delete', 'truncate', 'garbage'),
  pick: fc.nat(),
  within: fc.nat(),
  value: fc.oneof(fc.jsonValue({ maxDepth: 2 }), fc.constantFrom(1e308, -1, 0, '', 'x', [], {}, null, true, 1e6, -1e-9)),
  garbage: fc.string({ unit: 'binary', maxLength: 200 }),
});

function craft(dir: string, m: Mutation): string {
  const files = m.target === 'series' ? readdirSync(path.join(dir, 'series')).map((n) => path.join(dir, 'series', n)) : [path.join(dir, 'results.json')];
  const file = files[m.within % files.length];
  const text = readFileSync(file, 'utf8');
  if (m.kind === 'truncate') return writeFileSync(file, text.slice(0, m.pick % text.length)), file;
  if (m.kind === 'garbage') return writeFileSync(file, m.garbage), file;
  const data = JSON.parse(text) as Json;
  const groups = [...slotGroups(data).values()];
  const group = groups[m.pick % groups.length];
  const [container, key] = group[m.within % group.length];
  if (m.kind === 'delete') {
    if (Array.isArray(container)) container.splice(key as number, 1);
    else delete container[key as string];
  } else {
    (container as Record<string | number, Json>)[key] = m.value as Json;
  }
  writeFileSync(file, JSON.stringify(data));
  return file;
}

type Mutation = typeof mutation extends fc.Arbitrary<infer T> ? T : never;

describe('crafted series and results files', () => {
  it('200 mutated files: report and merge end with 0, 1 or 2, never a crash, and write the report whenever the results file itself is sound', async () => {
    let seriesProblems = 0;
    await fc.assert(
      fc.asyncProperty(mutation, async (m) => {
        const dir = mkdtempSync(path.join(tmpdir(), 'footing-crafted-'));
        cpSync(base, dir, { recursive: true });
        craft(dir, m);
        const html = path.join(dir, 'again.html');
        const report = await runReportCommand({ results: [dir], out: html });
        expect([0, 1, 2]).toContain(report.exitCode);
        const merged = path.join(dir, 'merged');
        const merge = mergeResults([dir], merged);
        expect([0, 1, 2]).toContain(merge.exitCode);
        if (report.exitCode !== 2) {
          expect(existsSync(html)).toBe(true);
          expect(existsSync(path.join(merged, 'report.html'))).toBe(true);
          if (/series unusable|not a footing-series|unreadable/.test(readFileSync(html, 'utf8'))) seriesProblems++;
        }
      }),
      { numRuns: 200 },
    );
    // The fuzz reached the per-run "series unusable" path, not only the results file's validation.
    expect(seriesProblems).toBeGreaterThan(10);
  }, 300_000);
});
