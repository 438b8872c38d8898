// Inputs bounded before work (harness/files/bounds.ts, harness/files/bounded.ts): nesting is
// refused from the raw text before any parser recurses, files that are not regular or too big are
// refused before they are read, long lists before the schema walks them, and a scenario must
// describe a run worth judging (enough ticks) and one that can finish (not too many steps).
import { spawnSync } from 'node:child_process';
import { copyFileSync, mkdirSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { FILE_LIMITS } from '../../harness/files/bounded.js';
import { checkPaths } from '../../harness/commands/check.js';
import { nestingProblemInText, SCENARIO_LIMITS } from '../../harness/files/bounds.js';
import { BASE_YAML, edit, errorsOf, load } from './helpers.js';

const DEPTH = SCENARIO_LIMITS.nestingDepth;

function folderWithGoodScenario(): string {
  const dir = mkdtempSync(path.join(tmpdir(), 'footing-bounds-'));
  mkdirSync(path.join(dir, 'robots'));
  copyFileSync('scenarios/robots/quad-24kg.yaml', path.join(dir, 'robots', 'quad-24kg.yaml'));
  writeFileSync(path.join(dir, 'good.yaml'), BASE_YAML);
  return dir;
}

/** k containers, each an array or an object (by the bits of `shape`), around a leaf. */
function nested(k: number, shape: number[], leaf: unknown): unknown {
  let value = leaf;
  for (let i = 0; i < k; i++) value = shape[i % shape.length] === 0 ? [value] : { [`k${i}`]: value, s: '[{"' };
  return value;
}

describe('nesting, refused from the raw text', () => {
  it('a 20,000-deep JSON scenario is refused with the limit named, the folder\'s other file still checked, and no V8 abort', () => {
    const dir = folderWithGoodScenario();
    writeFileSync(path.join(dir, 'deep.json'), `{"format":"footing-scenario","x":${'['.repeat(20_000)}${']'.repeat(20_000)}}`);
    // In a process of its own: the defect was an abort of the whole process (exit 134).
    const check = spawnSync(process.execPath, ['bin/footing.js', 'check', dir], { encoding: 'utf8' });
    expect(check.status).toBe(2);
    expect(check.stdout).toMatch(new RegExp(`deep.json:1:\\d+ /: nesting deeper than ${DEPTH} levels of \\[ and \\{ is refused before parsing`));
    expect(check.stdout).toMatch(/good.yaml: ok/);
    expect(check.stdout).toMatch(/checked 3 files: 2 ok, 1 with errors/);
  });

  it('compact block sequences ("- - - …") count as nesting too', async () => {
    const [error] = await errorsOf(`${BASE_YAML}pushes:\n${'- '.repeat(5000)}x\n`);
    expect(error.message).toMatch(/nests more than 256 columns deep .*refused before parsing/);
  });

  it('flags text nesting deeper than the limit, and only that, whatever the mix of arrays, objects and bracket-laden strings', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: DEPTH + 20 }), fc.array(fc.constantFrom(0, 1), { minLength: 1, maxLength: 8 }), fc.jsonValue({ maxDepth: 1 }), (k, shape, leaf) => {
        const text = JSON.stringify(nested(k, shape, leaf));
        const leafDepth = typeof leaf === 'object' && leaf !== null ? (JSON.stringify(leaf).match(/^[[{]+/)?.[0].length ?? 0) : 0;
        const problem = nestingProblemInText(text);
        // The leaf may add one level of its own (maxDepth 1).
        if (k + leafDepth > DEPTH) expect(problem).not.toBeNull();
        if (k + 1 <= DEPTH) expect(problem).toBeNull();
      }),
    );
  });

  it('lets ordinary YAML with quotes, apostrophes and comments through', () => {
    expect(nestingProblemInText(`title: "don't [stop] {me}" # a [comment\nnote: it's a '[quoted' one\n`)).toBeNull();
  });
});

describe('files, refused before they are read', () => {
  it('a FIFO named x.yaml is refused as not a regular file, without hanging', async () => {
    const dir = folderWithGoodScenario();
    const fifo = path.join(dir, 'x.yaml');
    expect(spawnSync('mkfifo', [fifo]).status).toBe(0);
    const outcome = await checkPaths([fifo, path.join(dir, 'good.yaml')]);
    expect(outcome.exitCode).toBe(2);
    expect(outcome.lines.join('\n')).toMatch(/x.yaml: 1 error\n.*cannot read the file \(a FIFO \(named pipe\), not a regular file/);
    expect(outcome.lines.join('\n')).toMatch(/good.yaml: ok/);
  });

  it('a file over the size limit is refused from its size, naming the limit', async () => {
    const dir = folderWithGoodScenario();
    const big = path.join(dir, 'big.yaml');
    writeFileSync(big, `${BASE_YAML}# ${'x'.repeat(FILE_LIMITS.inputFile_bytes)}\n`);
    const outcome = await checkPaths([big]);
    expect(outcome.exitCode).toBe(2);
    expect(outcome.lines.join('\n')).toMatch(/more than the 2 MiB allowed \(limit 2097152 bytes\); nothing was parsed/);
  });

  it('a list longer than the limit is refused at its path', async () => {
    const pushes = Array.from({ length: SCENARIO_LIMITS.listItems + 1 }, (_, i) => `  - { at_s: ${i / 1e5}, duration_s: 0.001, force_N: [1, 0, 0] }`).join('\n');
    const errors = await errorsOf(`${BASE_YAML}pushes:\n${pushes}\n`);
    expect(errors.map((e) => `${e.path} ${e.message}`)).toContain(`/pushes a list of ${SCENARIO_LIMITS.listItems + 1} items is refused (limit: ${SCENARIO_LIMITS.listItems} items per list)`);
  });
});

describe('the run a scenario describes', () => {
  it('refuses a duration shorter than the minimum ticks at the control rate', async () => {
    const errors = await errorsOf(edit([['duration_s: 8', 'duration_s: 0.005'], ['  - { at_s: 1, gait: trot, velocity_mps: [0.5, 0, 0] }\n', '']]));
    expect(errors.map((e) => e.message)).toContain(
      'duration_s 0.005 at 1000 Hz gives 5 control ticks, fewer than the 10 a run needs to be judged (expected duration_s × rate_Hz ≥ 10; see the default control rate)',
    );
  });

  it('refuses rate_Hz 0.4 over 8 s (3.2 ticks)', async () => {
    const errors = await errorsOf(edit([['duration_s: 8', 'duration_s: 8\ncontrol: { rate_Hz: 0.4 }']]));
    expect(errors.some((e) => /gives 3\.2 control ticks, fewer than the 10/.test(e.message))).toBe(true);
  });

  it('refuses step_s 1e-9 on a one-hour scenario, naming the smallest step allowed', async () => {
    const errors = await errorsOf(edit([['duration_s: 8', 'duration_s: 3600\nphysics: { step_s: 1.0e-9 }']]));
    const step = errors.find((e) => e.path === '/physics/step_s' && /physics steps/.test(e.message));
    expect(step?.message).toBe('step_s 1e-9 over duration_s 3600 is 3600000000000 physics steps, more than the 20000000 allowed per run (expected step_s ≥ 0.00018 s for this duration)');
  });

  it('accepts the bundled timing (8 s at 1 kHz with the default 0.5 ms step)', async () => {
    expect((await load(BASE_YAML)).ok).toBe(true);
  });
});
