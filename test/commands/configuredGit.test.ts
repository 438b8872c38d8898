// `margin` and `bench` with --config/--suite take the config's git-ref builds as `run` does: the
// ref is checked out and built in the one git cache (commands/gitBuilds.ts), a ref that names no
// commit is bad input (exit 2, nothing built), a build command that fails stops the command (exit 1).
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { runBenchCommand } from '../../harness/commands/bench.js';
import { EXIT } from '../../harness/commands/exit.js';
import { runMarginCommand } from '../../harness/commands/margin.js';
import type { ResultsFile } from '../../harness/results/types.js';
import { BUILD_COMMAND, createControllerRepo } from '../builds/git/repo.js';

const config = (builds: string, build = BUILD_COMMAND) => `version: 1
suites:
  merge:
    scenarios: ["scenarios/stand-dry.yaml"]
    builds: [main]
git:
  build: ${build}
  entry: dist/controller.mjs
builds:
${builds}
`;

describe('git-ref builds from the config in margin and bench', () => {
  it('margin --suite builds git:main in the cache and measures that commit', async () => {
    const repo = createControllerRepo({ config: config('  main: git:main') });
    const out = path.join(repo.dir, 'out', 'margin');
    const margin = await runMarginCommand({ cwd: repo.dir, suite: 'merge', build: [], out, tolerance: 0.2, jobs: 1, only: 'friction' });
    expect(margin.exitCode, margin.lines.join('\n')).not.toBe(EXIT.badInput);
    expect(margin.lines.join('\n')).toMatch(new RegExp(`build main: git main → ${repo.commits.main.slice(0, 12)} \\((cached|built in [\\d.]+ s)\\)`));
    const results = JSON.parse(readFileSync(path.join(out, 'results.json'), 'utf8')) as ResultsFile;
    expect(results.runs.map((r) => [r.scenario.id, r.build])).toEqual([['stand-dry', 'main']]);
    expect(results.runs[0].margin?.friction).toBeDefined();
    // The manifest names the commit measured: main's, although feature is checked out.
    expect(results.builds?.find((b) => b.name === 'main')?.commit).toBe(repo.commits.main);
  });

  it('bench --suite benches the built commit; the cache is reused on the second call', async () => {
    const repo = createControllerRepo({ config: config('  main: git:main') });
    const scenario = path.join(repo.dir, 'scenarios', 'stand-dry.yaml');
    const first = await runBenchCommand({ builds: [], suite: 'merge', scenario, time_ms: 20, cwd: repo.dir });
    expect(first.exitCode, first.lines.join('\n')).toBe(EXIT.pass);
    expect(first.report?.builds.map((b) => b.name)).toEqual(['main']);
    const second = await runBenchCommand({ builds: [], suite: 'merge', scenario, time_ms: 20, cwd: repo.dir });
    expect(second.lines.join('\n')).toMatch(/build main: git main → [0-9a-f]{12} \(cached\)/);
  });

  it('a ref that names no commit is bad input, named with its config item; nothing is built', async () => {
    const repo = createControllerRepo({ config: config('  main: git:mian') });
    const outcome = await runBenchCommand({ builds: [], suite: 'merge', scenario: path.join(repo.dir, 'scenarios', 'stand-dry.yaml'), time_ms: 20, cwd: repo.dir });
    expect(outcome.exitCode).toBe(EXIT.badInput);
    expect(outcome.lines.join('\n')).toMatch(/builds\.main.*ref "mian" names no commit/);
  });

  it('a build command that fails stops margin with exit 1 and its output, nothing measured', async () => {
    const repo = createControllerRepo({ config: config('  main: git:main', 'echo compiler says no >&2; exit 3') });
    const out = path.join(repo.dir, 'out', 'margin');
    const outcome = await runMarginCommand({ cwd: repo.dir, suite: 'merge', build: [], out, tolerance: 0.2, jobs: 1, only: 'friction' });
    expect(outcome.exitCode).toBe(EXIT.fail);
    const text = outcome.lines.join('\n');
    expect(text).toMatch(/build main FAILED/);
    expect(text).toMatch(/compiler says no/);
    expect(text).toMatch(/footing margin: nothing was measured; build main could not be built/);
  });
});
