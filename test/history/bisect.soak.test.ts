import { existsSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { runBisectCommand } from '../../harness/history/bisect/command.js';
import type { BisectRecord } from '../../harness/history/bisect/types.js';
import { COMMITS, createBisectRepo, OVERTRUSTING_COMMIT } from './bisectRepo.js';

// One short scenario (1 s of standing on a damp floor) keeps each probe to about a second.
const SCENARIO = 'scenarios/stand-damp.yaml';
const quick = { runTimeout: { base_s: 60, perSimulatedSecond: 30 } };

describe('footing bisect over a 16-commit controller repository (functions, no CLI)', () => {
  it(`names commit ${OVERTRUSTING_COMMIT}, the one that starts over-trusting friction, in at most ⌈log₂ 15⌉ + 1 = 5 builds`, async () => {
    const repo = createBisectRepo();
    const outcome = await runBisectCommand({ good: repo.commits[0], bad: 'main', paths: [SCENARIO], cwd: repo.dir, ...quick });
    expect(outcome.exitCode).toBe(0);
    const record = JSON.parse(readFileSync(path.join(repo.dir, 'out', 'bisect', 'bisect.json'), 'utf8')) as BisectRecord;
    expect(record.firstBad).toMatchObject({ index: OVERTRUSTING_COMMIT, commit: repo.commits[OVERTRUSTING_COMMIT], subject: 'step 11: trust the friction estimate more' });
    expect(record.firstBad?.reasons.join('\n')).toMatch(/friction margin/);
    expect(record.rangeSize).toBe(COMMITS - 1);
    expect(record.builds).toBeLessThanOrEqual(5);
    expect(record.buildBound).toBe(5);
    expect(record.skipped).toEqual([]);
    // Every tested commit carries its metric; the over-trusting ones have less friction margin.
    const margin = (index: number) => record.tested.find((t) => t.index === index)?.runs[0].metrics['stanceMargin.min'] as number;
    expect(margin(OVERTRUSTING_COMMIT)).toBeLessThan(margin(0) - 0.02);
    for (const t of record.tested) expect(t.verdict).toBe(t.index === 0 ? 'reference' : t.index >= OVERTRUSTING_COMMIT ? 'bad' : 'good');
    expect(readFileSync(path.join(repo.dir, 'out', 'bisect', 'bisect.md'), 'utf8')).toContain(`**First bad commit: \`${repo.commits[OVERTRUSTING_COMMIT].slice(0, 12)}\` step 11: trust the friction estimate more**`);

    // A second bisect of the same range reuses every build from the cache.
    const again = await runBisectCommand({ good: repo.commits[0], bad: 'main', paths: [SCENARIO], cwd: repo.dir, ...quick });
    expect(again.record?.tested.every((t) => t.cached)).toBe(true);
    expect(again.record?.firstBad?.index).toBe(OVERTRUSTING_COMMIT);
  });

  it('still names commit 11 when commit 7 does not build, and reports 7 as skipped', async () => {
    const repo = createBisectRepo({ unbuildable: 7 });
    const outcome = await runBisectCommand({ good: repo.commits[0], bad: 'main', paths: [SCENARIO], cwd: repo.dir, out: 'bisect-out', ...quick });
    expect(outcome.exitCode).toBe(0);
    const record = outcome.record as BisectRecord;
    expect(record.firstBad?.commit).toBe(repo.commits[OVERTRUSTING_COMMIT]);
    expect(record.skipped).toEqual([expect.objectContaining({ index: 7, commit: repo.commits[7], subject: 'step 7: move the controller source (breaks the build)' })]);
    expect(record.skipped[0].message).toMatch(/build command .* exited with status/);
    expect(outcome.lines.at(-1)).toMatch(new RegExp(`first bad commit ${repo.commits[OVERTRUSTING_COMMIT].slice(0, 12)} .*1 skipped \\(${repo.commits[7].slice(0, 12)}\\)`));
    expect(existsSync(path.join(repo.dir, 'bisect-out', 'bisect.json'))).toBe(true);
  });

  it('refuses a good ref that is not an ancestor of the bad one, and a rule it does not know, building nothing (exit 2)', async () => {
    const repo = createBisectRepo();
    const reversed = await runBisectCommand({ good: 'main', bad: repo.commits[3], paths: [SCENARIO], cwd: repo.dir });
    expect(reversed.exitCode).toBe(2);
    expect(reversed.lines[0]).toMatch(/is not an ancestor of --bad/);
    const rule = await runBisectCommand({ good: repo.commits[0], bad: 'main', rule: 'frictionMargin.mean', paths: [SCENARIO], cwd: repo.dir });
    expect(rule.exitCode).toBe(2);
    expect(rule.lines[0]).toMatch(/--rule "frictionMargin\.mean": expected "gate", a gate rule name/);
    const missing = await runBisectCommand({ good: repo.commits[0], bad: 'main', paths: ['scenarios/stand-wet.yaml'], cwd: repo.dir });
    expect(missing.exitCode).toBe(2);
    expect(missing.lines.join('\n')).toMatch(/stand-wet\.yaml/);
    expect(missing.lines.at(-1)).toBe('footing bisect: nothing was built');
    expect(existsSync(path.join(repo.dir, '.footing-cache'))).toBe(false);
  });
});
