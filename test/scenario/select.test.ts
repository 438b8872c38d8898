// Scenario selection (docs/scenarios.md "Selecting scenarios"): --tag T (repeatable, every one
// must match), --exclude-tag T (any excludes), --grep PATTERN (regular expression on the id), for
// run, margin and check; a suite of footing.config.yaml may name tags and excluded tags.

import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { checkPaths } from '../../harness/commands/check.js';
import { EXIT } from '../../harness/commands/exit.js';
import { runMarginCommand } from '../../harness/commands/margin.js';
import { runConfiguredSuite, runSuite } from '../../harness/commands/run.js';
import { resolveSettings } from '../../harness/config/resolve.js';
import type { ResultsFile } from '../../harness/results/types.js';
import { selectScenarios, SelectionError } from '../../harness/scenario/select.js';

const FIXTURES = path.resolve('test/scenario/fixtures/selection');
const fresh = (name: string) => mkdtempSync(path.join(tmpdir(), `footing-${name}-`));
const ids = (dir: string) => (JSON.parse(readFileSync(path.join(dir, 'results.json'), 'utf8')) as ResultsFile).runs.map((r) => r.scenario.id);

const SCENARIOS = [
  { id: 'tag-dry-stand', tags: ['dry', 'stand'] },
  { id: 'tag-wet-stand', tags: ['wet', 'stand'] },
  { id: 'tag-wet-push', tags: ['wet', 'push'] },
];
const pick = (selection: Parameters<typeof selectScenarios>[1]) => selectScenarios(SCENARIOS, selection).map((s) => s.id);

describe('selectScenarios', () => {
  it('keeps every scenario when nothing is named, in order', () => {
    expect(pick(undefined)).toEqual(['tag-dry-stand', 'tag-wet-stand', 'tag-wet-push']);
    expect(pick({ tags: [], excludeTags: [] })).toEqual(['tag-dry-stand', 'tag-wet-stand', 'tag-wet-push']);
  });
  it('--tag repeated: every tag must match', () => {
    expect(pick({ tags: ['wet'] })).toEqual(['tag-wet-stand', 'tag-wet-push']);
    expect(pick({ tags: ['wet', 'stand'] })).toEqual(['tag-wet-stand']);
    expect(pick({ tags: ['wet', 'dry'] })).toEqual([]);
  });
  it('--exclude-tag: any named tag leaves a scenario out, also against --tag', () => {
    expect(pick({ excludeTags: ['push', 'dry'] })).toEqual(['tag-wet-stand']);
    expect(pick({ tags: ['stand'], excludeTags: ['stand'] })).toEqual([]);
  });
  it('--grep: a regular expression searched in the id', () => {
    expect(pick({ grep: 'stand$' })).toEqual(['tag-dry-stand', 'tag-wet-stand']);
    expect(pick({ grep: '^tag-wet', excludeTags: ['push'] })).toEqual(['tag-wet-stand']);
    expect(() => pick({ grep: '(' })).toThrow(SelectionError);
    expect(() => pick({ grep: '(' })).toThrow(/--grep \(: not a regular expression/);
  });
});

describe('footing check with a selection', () => {
  it('names the scenarios selected, or why none (exit 2)', async () => {
    const some = await checkPaths([FIXTURES], {}, { tags: ['wet'], excludeTags: ['push'] });
    expect(some.exitCode).toBe(EXIT.pass);
    expect(some.lines.at(-1)).toBe('--tag wet --exclude-tag push selects 1 of 3: tag-wet-stand');
    const none = await checkPaths([FIXTURES], {}, { tags: ['ice'] });
    expect(none.exitCode).toBe(EXIT.badInput);
    expect(none.lines.at(-1)).toBe('--tag ice: no scenario of 3 matches (their tags: dry, push, stand, wet)');
  });
});

describe('footing run and margin with a selection', () => {
  it('run --tag wet --grep stand runs that scenario only', async () => {
    const out = fresh('select-run');
    const outcome = await runSuite({ paths: [FIXTURES], builds: ['ref:nominal'], outDir: out, selection: { tags: ['wet'], grep: 'stand' }, jobs: 1, quiet: true });
    expect(outcome.exitCode).not.toBe(EXIT.badInput);
    expect(ids(out)).toEqual(['tag-wet-stand']);
  });

  it('run: a selection that keeps nothing is bad input, nothing run', async () => {
    const outcome = await runSuite({ paths: [FIXTURES], builds: ['ref:nominal'], outDir: fresh('select-none'), selection: { grep: 'nosuch' }, quiet: true });
    expect(outcome.exitCode).toBe(EXIT.badInput);
    expect(outcome.lines.join('\n')).toMatch(/--grep nosuch: no scenario of 3 matches.*nothing was run/);
  });

  it('a config suite names tags; --tag adds to them; margin --suite reads the same suite', async () => {
    const dir = fresh('select-config');
    writeFileSync(
      path.join(dir, 'footing.config.yaml'),
      `suites:\n  wet:\n    scenarios: [${JSON.stringify(FIXTURES)}]\n    tags: [wet]\n    excludeTags: [push]\n    builds: [nominal]\nbuilds:\n  nominal: ref:nominal\n`,
    );
    expect(resolveSettings({ cwd: dir, suite: 'wet', tags: ['stand'] }).selection).toEqual({ tags: ['wet', 'stand'], excludeTags: ['push'], grep: undefined });
    const out = path.join(dir, 'out');
    const run = await runConfiguredSuite({ cwd: dir, suite: 'wet', out, jobs: 1, quiet: true });
    expect(run.exitCode).not.toBe(EXIT.badInput);
    expect(ids(out)).toEqual(['tag-wet-stand']);

    const marginOut = path.join(dir, 'margin');
    const margin = await runMarginCommand({ cwd: dir, suite: 'wet', build: [], out: marginOut, tolerance: 0.2, jobs: 1, only: 'friction' });
    expect(margin.exitCode, margin.lines.join('\n')).not.toBe(EXIT.badInput);
    expect(ids(marginOut)).toEqual(['tag-wet-stand']);
  });

  it('margin --suite of a suite that does not exist is bad input with a suggestion', async () => {
    const dir = fresh('select-bad-suite');
    writeFileSync(path.join(dir, 'footing.config.yaml'), `suites:\n  wet: [${JSON.stringify(FIXTURES)}]\n`);
    const margin = await runMarginCommand({ cwd: dir, suite: 'wte', build: [], out: path.join(dir, 'm') });
    expect(margin.exitCode).toBe(EXIT.badInput);
    expect(margin.lines.join('\n')).toMatch(/--suite wte: .* has no suite of that name; did you mean "wet"\?/);
  });
});
