// Flag errors are bad input: exit 2 with a message naming the flag, and nothing run. The CLI is
// called in-process (harness/cli/main.ts), its output captured.
import { existsSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { main } from '../../harness/cli/main.js';

async function footing(...args: string[]): Promise<{ exitCode: number; text: string }> {
  const chunks: string[] = [];
  const capture = (chunk: string | Uint8Array) => {
    chunks.push(String(chunk));
    return true;
  };
  vi.spyOn(process.stdout, 'write').mockImplementation(capture);
  vi.spyOn(process.stderr, 'write').mockImplementation(capture);
  const exitCode = await main(args);
  vi.restoreAllMocks();
  return { exitCode, text: chunks.join('') };
}

const SCENARIO = 'test/run/fixtures/mini/short-stand.yaml';

describe('flag errors exit 2 before any work', () => {
  afterEach(() => vi.restoreAllMocks());

  it.each([
    [['--jobs', 'abc'], /--jobs: not a number: expected a whole number ≥ 1/],
    [['--jobs', '0'], /--jobs 0: expected a whole number ≥ 1/],
    [['--jobs', '1.5'], /--jobs 1\.5: expected a whole number ≥ 1/],
    [['--loop-budget', '-5'], /--loop-budget -5: expected a number > 0/],
  ])('run %j is refused with the flag named, and writes nothing', async (flags, message) => {
    const out = path.join(mkdtempSync(path.join(tmpdir(), 'footing-cli-')), 'out');
    const result = await footing('run', SCENARIO, '--build', 'ref:governed', '--out', out, ...flags);
    expect(result.exitCode).toBe(2);
    expect(result.text).toMatch(message);
    expect(existsSync(out)).toBe(false);
  });

  it('offers the reference build a misspelt ref: id meant', async () => {
    const result = await footing('run', SCENARIO, '--build', 'ref:governd', '--out', path.join(tmpdir(), 'never'));
    expect(result.exitCode).toBe(2);
    expect(result.text).toMatch(/unknown reference build 'governd'; did you mean 'ref:governed'\?/);
  });

  it('refuses a module build whose file is missing, naming it, with nothing run', async () => {
    const result = await footing('run', SCENARIO, '--build', 'mine=/nowhere/controller.js', '--out', path.join(tmpdir(), 'never'));
    expect(result.exitCode).toBe(2);
    expect(result.text).toMatch(/--build mine=\/nowhere\/controller\.js: module file \/nowhere\/controller\.js does not exist; nothing was run/);
  });

  it('never takes a scenario path after --build as a second build', async () => {
    // --build takes one value; the path stays a positional (it would fail as a build spec).
    const out = path.join(mkdtempSync(path.join(tmpdir(), 'footing-cli-')), 'out');
    const result = await footing('run', '--build', 'ref:governed', SCENARIO, '--out', out, '--quiet');
    expect(result.text).not.toMatch(/no build name/);
    expect(result.exitCode).toBe(0);
    expect(existsSync(path.join(out, 'results.json'))).toBe(true);
  });

  it('cache without an action prints what to name and exits 2', async () => {
    const result = await footing('cache');
    expect(result.exitCode).toBe(2);
    expect(result.text).toMatch(/footing cache: name an action: footing cache --clear/);
  });
});

describe('a closed output pipe', () => {
  it('ends footing quietly (footing … | head), with no stack trace', async () => {
    const { spawn } = await import('node:child_process');
    const child = spawn(process.execPath, ['bin/footing.js', 'check', 'scenarios'], { stdio: ['ignore', 'pipe', 'pipe'] });
    // The reader goes away before footing has written anything: every write then fails with EPIPE.
    child.stdout.destroy();
    let stderr = '';
    child.stderr.on('data', (chunk) => (stderr += String(chunk)));
    const code = await new Promise<number | null>((resolve) => child.on('close', resolve));
    expect(stderr).not.toMatch(/EPIPE|Error|at /);
    expect(code).toBe(0);
  });
});
