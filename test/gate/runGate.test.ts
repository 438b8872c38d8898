import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { runGate } from '../../harness/commands/gate.js';
import { parsePairs } from '../../harness/gate/pairing.js';
import { writeResultsJson } from '../../harness/results/writeJson.js';
import { results, scoredRun, walk, walkChanged } from './fixtures.js';

let dir: string;
beforeEach(() => {
  dir = mkdtempSync(join(tmpdir(), 'footing-gate-'));
  mkdirSync(join(dir, 'main'));
  mkdirSync(join(dir, 'branch'));
  writeResultsJson(join(dir, 'main', 'results.json'), results([scoredRun(walk, 'ref:governed', { fx_N: 4 })]));
});
afterEach(() => rmSync(dir, { recursive: true, force: true }));

function candidate(fx_N: number, scenario = walk): void {
  writeResultsJson(join(dir, 'branch', 'results.json'), results([scoredRun(scenario, 'ref:trusting', { fx_N })]));
}

describe('runGate', () => {
  it('exits 0 when the candidate holds, reading folders', async () => {
    candidate(4);
    const result = await runGate({ baseline: join(dir, 'main'), candidate: join(dir, 'branch') });
    expect(result).toEqual({
      exitCode: 0,
      lines: ['gate: hold — nothing the candidate changed breaks a rule in 1 compared run', '  Runs: 0 new failures, 0 still failing, 0 fixed, 1 passing.'],
    });
  });

  it('exits 1 naming friction margin when a rule breaks, and writes gate.md', async () => {
    candidate(8); // margin 0.75 → 0.5
    const out = join(dir, 'report');
    const result = await runGate({ baseline: join(dir, 'main', 'results.json'), candidate: join(dir, 'branch'), out });
    expect(result.exitCode).toBe(1);
    // The verdict line names the first blocking rule, its scenario and builds.
    expect(result.lines[0]).toBe(
      'gate: block — ice-walk (ref:governed → ref:trusting): stance friction margin min fell by 0.250 (0.750 → 0.500), more than the 0.02 allowed (and 1 more blocking)',
    );
    expect(result.lines.join('\n')).toContain('blocking: ice-walk (ref:governed → ref:trusting): stance friction margin p05 fell by 0.250');
    const markdown = readFileSync(join(out, 'gate.md'), 'utf8');
    expect(markdown).toContain('### Footing gate: ❌ block — ice-walk (ref:governed → ref:trusting): stance friction margin min fell by 0.250');
    expect(markdown).toContain('| ice-walk | ref:governed → ref:trusting | stanceMargin.min | 0.750 | 0.500 | −0.250 | loss ≤ 0.02 ❌ |');
  });

  it('applies a policy file', async () => {
    candidate(8);
    const policyFile = join(dir, 'policy.yaml');
    writeFileSync(policyFile, 'frictionMarginMinLoss: 0.3\nfrictionMarginP05Loss: 0.3\n');
    expect((await runGate({ baseline: join(dir, 'main'), candidate: join(dir, 'branch'), policyFile })).exitCode).toBe(0);
  });

  it('exits 2 with the file and problem for bad input', async () => {
    candidate(4);
    const missing = await runGate({ baseline: join(dir, 'nowhere'), candidate: join(dir, 'branch') });
    expect(missing.exitCode).toBe(2);
    expect(missing.lines.join('\n')).toContain('nowhere: no such file or folder');

    writeFileSync(join(dir, 'main', 'results.json'), '{"format": "footing-results", "formatVersion": 9}');
    const invalid = await runGate({ baseline: join(dir, 'main'), candidate: join(dir, 'branch') });
    expect(invalid.exitCode).toBe(2);
    expect(invalid.lines.join('\n')).toContain('/formatVersion: must be equal to constant');

    const policyFile = join(dir, 'policy.yaml');
    writeFileSync(policyFile, 'allowNewFall: true\n');
    const badPolicy = await runGate({ baseline: join(dir, 'branch'), candidate: join(dir, 'branch'), policyFile });
    expect(badPolicy).toEqual({ exitCode: 2, lines: [`gate: ${policyFile}:1:1: allowNewFall: unknown key; did you mean "allowNewFalls"?`] });

    const badPair = await runGate({ baseline: join(dir, 'branch'), candidate: join(dir, 'branch'), pairs: ['ref:trusting'] });
    expect(badPair).toEqual({ exitCode: 2, lines: ['gate: --pair "ref:trusting": expected BASE=CAND, two build names joined by "="'] });
  });

  it('exits 2 when nothing is comparable, saying why', async () => {
    candidate(4, walkChanged);
    const result = await runGate({ baseline: join(dir, 'main'), candidate: join(dir, 'branch') });
    expect(result.exitCode).toBe(2);
    expect(result.lines.join('\n')).toContain('gate: nothing to compare');
    expect(result.lines.join('\n')).toContain('not comparable: ice-walk: scenario changed (revision 1 → 2');
  });
});

describe('parsePairs', () => {
  it('splits BASE=CAND', () => {
    expect(parsePairs(['main=ref:governed', ' a = b '])).toEqual([['main', 'ref:governed'], ['a', 'b']]);
  });
});
