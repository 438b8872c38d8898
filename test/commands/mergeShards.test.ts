// footing merge checks its inputs: every shard of one suite, once each; and the merged folder
// stands alone (series carried, so `footing report` on it draws every plot).
import { existsSync, mkdtempSync, readdirSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { mergeResults } from '../../harness/commands/merge.js';
import { runReportCommand } from '../../harness/commands/report.js';
import { runSuite } from '../../harness/commands/run.js';

const MINI = 'test/run/fixtures/mini';
const fresh = (name: string) => mkdtempSync(path.join(tmpdir(), `footing-${name}-`));

describe('footing merge of shards', () => {
  const shards: string[] = [];
  let other: string;
  beforeAll(async () => {
    for (const k of [1, 2]) {
      const dir = fresh(`shard${k}`);
      await runSuite({ paths: [MINI], builds: ['ref:nominal', 'ref:governed'], outDir: dir, jobs: 1, shard: `${k}/2`, quiet: true });
      shards.push(dir);
    }
    // The same shard count over other builds: another suite.
    other = fresh('other');
    await runSuite({ paths: [MINI], builds: ['ref:nominal', 'ref:clamped'], outDir: other, jobs: 1, shard: '2/2', quiet: true });
  }, 120_000);

  it('refuses one shard of two, naming the missing one (exit 2, nothing written)', () => {
    const out = path.join(fresh('merged'), 'out');
    const outcome = mergeResults([shards[0]], out);
    expect(outcome.exitCode).toBe(2);
    expect(outcome.lines.join('\n')).toMatch(/shard 2 of 2 missing \(given: 1\)/);
    expect(existsSync(out)).toBe(false);
  });

  it('refuses the same shard twice', () => {
    const outcome = mergeResults([shards[0], shards[0]], path.join(fresh('merged'), 'out'));
    expect(outcome.exitCode).toBe(2);
    expect(outcome.lines.join('\n')).toMatch(/shard 1\/2 is given twice/);
  });

  it('refuses shards of different suites', () => {
    const outcome = mergeResults([shards[0], other], path.join(fresh('merged'), 'out'));
    expect(outcome.exitCode).toBe(2);
    expect(outcome.lines.join('\n')).toMatch(/of a different suite/);
  });

  it('merges every shard once, carrying the series so the merged folder re-renders on its own', async () => {
    const out = path.join(fresh('merged'), 'out');
    const outcome = mergeResults(shards, out);
    expect(outcome.exitCode, outcome.lines.join('\n')).toBeLessThan(2);
    // 2 scenarios × 2 builds = 4 runs, each with its series file.
    expect(readdirSync(path.join(out, 'series')).filter((f) => f.endsWith('.json'))).toHaveLength(4);
    // Re-rendered from the merged folder alone (exit 1 only says some runs failed acceptance).
    const report = await runReportCommand({ results: [out], out: path.join(out, 'again.html') });
    expect(report.exitCode, report.lines.join('\n')).toBeLessThan(2);
    const html = readFileSync(path.join(out, 'again.html'), 'utf8');
    expect(html).not.toContain('class="no-series"');
  });
});
