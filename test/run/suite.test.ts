import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { XMLParser } from 'fast-xml-parser';
import { describe, expect, it } from 'vitest';
import { runGate } from '../../harness/commands/gate.js';
import { isAtomicTempName } from '../../harness/files/atomic.js';
import { mergeResults } from '../../harness/commands/merge.js';
import { validateResults } from '../../harness/results/validate.js';
import type { ResultsFile } from '../../harness/results/types.js';
import { EXIT } from '../../harness/commands/exit.js';
import { runSuite } from '../../harness/commands/run.js';
import { expectStrictJunit } from '../support/junit.js';
import { deterministicPart } from '../support/deterministicRun.js';

const MINI = 'test/run/fixtures/mini';
const fresh = (name: string) => mkdtempSync(path.join(tmpdir(), `footing-${name}-`));
const readResults = (dir: string) => JSON.parse(readFileSync(path.join(dir, 'results.json'), 'utf8')) as ResultsFile;

describe('footing run, end to end', () => {
  it('writes every result file, valid and parseable, and the gate blocks the over-trusting build on friction margin', async () => {
    const out = fresh('e2e');
    // The bundled wet push: on the wet floor the over-trusting build puts its stance feet on the
    // cone (stance margin 0; on the dry walk it holds in stance and only its landings slide).
    const outcome = await runSuite({ paths: [`${MINI}/short-stand.yaml`, 'scenarios/lateral-push-wet.yaml'], builds: ['ref:governed', 'ref:overtrusting'], outDir: out, trace: true, jobs: 2, quiet: true });
    expect([EXIT.pass, EXIT.fail]).toContain(outcome.exitCode);
    for (const file of ['results.json', 'junit.xml', 'summary.md', 'report.html']) expect(existsSync(path.join(out, file))).toBe(true);

    const results = readResults(out);
    const validation = validateResults(results);
    expect(validation.ok).toBe(true);
    expect(results.runs.map((r) => `${r.scenario.id}/${r.build}`)).toEqual([
      'lateral-push-wet/governed',
      'lateral-push-wet/overtrusting',
      'short-stand/governed',
      'short-stand/overtrusting',
    ]);
    for (const run of results.runs) expect(existsSync(path.join(out, run.trace as string))).toBe(true);

    // JUnit XML read back by a real XML parser: one testsuite per build, one testcase per scenario.
    const xml = new XMLParser({ ignoreAttributes: false }).parse(readFileSync(path.join(out, 'junit.xml'), 'utf8'));
    const suites = [xml.testsuites.testsuite].flat();
    expect(suites.map((s: Record<string, string>) => s['@_name'])).toEqual(['governed', 'overtrusting']);
    for (const s of suites) expect([s.testcase].flat()).toHaveLength(2);
    expectStrictJunit(out);

    // The over-trusting build asks for more tangential force than the floor gives: the gate names
    // friction margin. Baseline and candidate are the two builds of one results file.
    const gateOut = fresh('gate');
    const single = (build: string) => {
      const dir = fresh(build);
      const only = { ...results, builds: results.builds.filter((b) => b.name === build), runs: results.runs.filter((r) => r.build === build) };
      writeFileSync(path.join(dir, 'results.json'), JSON.stringify(only));
      return dir;
    };
    const verdict = await runGate({ baseline: single('governed'), candidate: single('overtrusting'), out: gateOut });
    expect(verdict.exitCode).toBe(1);
    expect(verdict.lines.join('\n')).toMatch(/friction margin/i);
  });

  it('gives bit-identical metrics (loop times aside) with --jobs 1 and --jobs 2', async () => {
    const a = fresh('j1');
    const b = fresh('j2');
    await runSuite({ paths: [MINI], builds: ['ref:nominal', 'ref:governed'], outDir: a, jobs: 1, quiet: true });
    await runSuite({ paths: [MINI], builds: ['ref:nominal', 'ref:governed'], outDir: b, jobs: 2, quiet: true });
    expect(readResults(a).runs.map(deterministicPart)).toEqual(readResults(b).runs.map(deterministicPart));
  });

  it('shards 1/3, 2/3, 3/3 merged equal the unsharded run', async () => {
    const whole = fresh('whole');
    await runSuite({ paths: [MINI], builds: ['ref:nominal', 'ref:governed', 'ref:clamped'], outDir: whole, jobs: 2, quiet: true });
    const shards = [1, 2, 3].map((k) => fresh(`shard${k}`));
    for (const [k, dir] of shards.entries()) {
      await runSuite({ paths: [MINI], builds: ['ref:nominal', 'ref:governed', 'ref:clamped'], outDir: dir, jobs: 1, shard: `${k + 1}/3`, quiet: true });
    }
    const counts = shards.map((dir) => readResults(dir).runs.length);
    expect(counts.reduce((x, y) => x + y, 0)).toBe(6);
    expect(Math.max(...counts)).toBeLessThanOrEqual(3); // balanced: no shard holds most of the work
    const merged = fresh('merged');
    expect(mergeResults(shards, merged).exitCode).not.toBe(EXIT.badInput);
    expect(readResults(merged).runs.map(deterministicPart)).toEqual(readResults(whole).runs.map(deterministicPart));
  });

  it('refuses bad input with exit 2 and runs nothing', async () => {
    const out = fresh('bad');
    const badBuild = await runSuite({ paths: [MINI], builds: ['ref:nosuch'], outDir: out, quiet: true });
    expect(badBuild.exitCode).toBe(EXIT.badInput);
    expect(badBuild.lines.join('\n')).toMatch(/nosuch/);
    const badPath = await runSuite({ paths: ['test/run/fixtures/does-not-exist'], builds: ['ref:nominal'], outDir: out, quiet: true });
    expect(badPath.exitCode).toBe(EXIT.badInput);
    expect(badPath.lines.join('\n')).toMatch(/does-not-exist.*no such file or folder/);
    expect(existsSync(path.join(out, 'results.json'))).toBe(false);
  });
});

describe('interrupted runs', () => {
  function startRun(out: string): ReturnType<typeof spawn> {
    return spawn(
      process.execPath,
      ['bin/footing.js', 'run', MINI, '-b', 'ref:nominal', '-b', 'ref:governed', '-b', 'ref:clamped', '-b', 'ref:qp', '--jobs', '1', '--out', out, '--quiet'],
      { stdio: 'ignore' },
    );
  }

  async function killAfterFirstRun(out: string, signal: NodeJS.Signals): Promise<void> {
    const child = startRun(out);
    const runs = path.join(out, 'runs');
    const exited = new Promise((resolve) => child.on('exit', resolve));
    for (let k = 0; k < 600; k++) {
      await new Promise((r) => setTimeout(r, 50));
      if (existsSync(runs) && readdirSync(runs).some((n) => n.endsWith('.json') && !isAtomicTempName(n))) break;
    }
    child.kill(signal);
    await exited;
  }

  function assertNoTruncatedFile(out: string): void {
    for (const dir of [out, path.join(out, 'runs')]) {
      if (!existsSync(dir)) continue;
      for (const name of readdirSync(dir)) {
        if (isAtomicTempName(name) || !name.endsWith('.json')) continue;
        expect(() => JSON.parse(readFileSync(path.join(dir, name), 'utf8'))).not.toThrow();
      }
    }
  }

  it.each(['SIGTERM', 'SIGKILL'] as const)('%s midway leaves no truncated file and --resume finishes the suite', async (signal) => {
    const out = fresh(signal);
    await killAfterFirstRun(out, signal);
    assertNoTruncatedFile(out);
    const before = readdirSync(path.join(out, 'runs')).filter((n) => n.endsWith('.json') && !isAtomicTempName(n)).length;
    expect(before).toBeGreaterThan(0);
    expect(before).toBeLessThan(8);

    const resumed = await runSuite({
      paths: [MINI],
      builds: ['ref:nominal', 'ref:governed', 'ref:clamped', 'ref:qp'],
      outDir: out,
      jobs: 2,
      resume: true,
      quiet: true,
    });
    expect(resumed.lines.join('\n')).toMatch(new RegExp(`resuming: ${before} of 8 runs already complete`));
    expect(readResults(out).runs).toHaveLength(8);
    assertNoTruncatedFile(out);
  });
});
