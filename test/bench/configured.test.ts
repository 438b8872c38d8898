// `footing bench --config/--suite` benches the builds footing.config.yaml names (the suite's), as
// `footing run` resolves them; git-ref builds are built as run builds them (test/commands/configuredGit.test.ts).

import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { runBenchCommand } from '../../harness/commands/bench.js';
import { EXIT } from '../../harness/commands/exit.js';

const SCENARIO = path.resolve('test/scenario/fixtures/selection/tag-dry-stand.yaml');

function project(config: string): string {
  const dir = mkdtempSync(path.join(tmpdir(), 'footing-bench-config-'));
  writeFileSync(path.join(dir, 'footing.config.yaml'), config);
  return dir;
}

describe('footing bench with the config file', () => {
  it('--suite benches that suite\'s builds only', async () => {
    const dir = project(`suites:\n  quick:\n    scenarios: [${JSON.stringify(path.dirname(SCENARIO))}]\n    builds: [nominal]\nbuilds:\n  nominal: ref:nominal\n  qp: ref:qp\n`);
    const outcome = await runBenchCommand({ builds: [], suite: 'quick', scenario: SCENARIO, time_ms: 20, cwd: dir });
    expect(outcome.exitCode, outcome.lines.join('\n')).toBe(EXIT.pass);
    expect(outcome.report?.builds.map((b) => b.name)).toEqual(['nominal']);
  });

  it('a git-ref build outside a git repository is bad input, named with its config item (exit 2)', async () => {
    const dir = project(`suites:\n  merge: [${JSON.stringify(path.dirname(SCENARIO))}]\ngit: { entry: build/ctl }\nbuilds:\n  main: git:main\n`);
    const outcome = await runBenchCommand({ builds: [], suite: 'merge', scenario: SCENARIO, time_ms: 20, cwd: dir });
    expect(outcome.exitCode).toBe(EXIT.badInput);
    expect(outcome.lines.join('\n')).toMatch(/footing\.config\.yaml:5:9: builds\.main: .*\n.*nothing was run; fix the refs above/);
  });
});
