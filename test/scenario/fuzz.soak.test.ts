// Property test: whatever text arrives, the loader returns a typed result — never throws, never
// reports an internal error. ≥ 10,000 generated malformed inputs in total across the properties.

import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { parse, stringify } from 'yaml';
import { loadScenarioText, type LoadResult } from '../../harness/scenario/index.js';
import { memoryFiles, memoryOptions } from './helpers.js';

import { SEEDS } from './fuzz-seeds.js';

// One shared cache: the robot file is parsed once, so each case costs one scenario load.
const OPTIONS = memoryOptions(memoryFiles({ '/suite/series/shove-lateral.csv': 't_s,fx_N,fy_N,fz_N\n0,0,0,0\n0.1,0,5,0\n' }), true);

function assertTyped(r: LoadResult): void {
  expect(typeof r.ok).toBe('boolean');
  if (r.ok) {
    expect(r.scenarios.length).toBeGreaterThan(0);
    for (const s of r.scenarios) expect(s.hash).toMatch(/^[0-9a-f]{64}$/);
  } else {
    expect(r.errors.length).toBeGreaterThan(0);
    for (const e of r.errors) {
      expect(typeof e.file).toBe('string');
      expect(typeof e.path).toBe('string');
      expect(typeof e.message).toBe('string');
      expect(e.message).not.toMatch(/internal error/);
    }
  }
}

const run = async (text: string) => assertTyped(await loadScenarioText(text, '/suite/s.yaml', OPTIONS));

const YAML_NOISE = fc.constantFrom(':', ' ', '\n', '  ', '-', '[', ']', '{', '}', ',', '#', '&a', '*a', '!!str ', '!!binary ', '|', '>', "'", '"', '%', '@', '`', '\t', '.nan', '.inf', '-.inf', '1e400', '0x1F', '~', 'null', '<<: ', '---\n', '...', '\\', '\u0000', '\uFEFF');

const mutation = fc.oneof(
  fc.record({ kind: fc.constant('delete' as const), at: fc.nat(), length: fc.integer({ min: 1, max: 20 }) }),
  fc.record({ kind: fc.constant('insert' as const), at: fc.nat(), text: fc.oneof(YAML_NOISE, fc.string({ maxLength: 8 })) }),
  fc.record({ kind: fc.constant('dupLine' as const), at: fc.nat() }),
  fc.record({ kind: fc.constant('swapLines' as const), at: fc.nat(), other: fc.nat() }),
);

type Mutation = typeof mutation extends fc.Arbitrary<infer T> ? T : never;

function applyMutations(text: string, mutations: Mutation[]): string {
  let t = text;
  for (const m of mutations) {
    const at = t.length ? m.at % t.length : 0;
    if (m.kind === 'delete') t = t.slice(0, at) + t.slice(at + m.length);
    else if (m.kind === 'insert') t = t.slice(0, at) + m.text + t.slice(at);
    else {
      const lines = t.split('\n');
      const i = m.at % lines.length;
      if (m.kind === 'dupLine') lines.splice(i, 0, lines[i]);
      else {
        const j = m.other % lines.length;
        [lines[i], lines[j]] = [lines[j], lines[i]];
      }
      t = lines.join('\n');
    }
  }
  return t;
}

/** Sets a value at a random place of a parsed seed (wrong types, huge numbers, NaN, ∞). */
function setAt(value: unknown, path: number[], replacement: unknown): unknown {
  if (path.length === 0 || value === null || typeof value !== 'object') return replacement;
  const keys = Object.keys(value as object);
  if (keys.length === 0) return replacement;
  const key = keys[path[0] % keys.length];
  const copy: Record<string, unknown> = Array.isArray(value) ? ([...value] as unknown as Record<string, unknown>) : { ...(value as Record<string, unknown>) };
  copy[key] = setAt(copy[key], path.slice(1), replacement);
  return copy;
}

const weirdValue = fc.oneof(
  fc.constantFrom(Number.NaN, Infinity, -Infinity, 1e308, -1e308, Number.MAX_SAFE_INTEGER + 2, 5e-324, -0, '', 'standing', 'truth', 'trot', null, true, [], {}, [[[]]]),
  fc.double(),
  fc.integer(),
  fc.string({ maxLength: 10 }),
  fc.anything({ maxDepth: 3 }),
);

describe('the loader on malformed input (fast-check)', () => {
  it('returns a typed result for mutated valid files', async () => {
    await fc.assert(
      fc.asyncProperty(fc.constantFrom(...SEEDS, SEEDS[0], SEEDS[2]), fc.array(mutation, { minLength: 1, maxLength: 4 }), async (seed, ms) => run(applyMutations(seed, ms))),
      { numRuns: 3500 },
    );
  });

  it('returns a typed result for wrong types and extreme numbers at random places', async () => {
    await fc.assert(
      fc.asyncProperty(fc.constantFrom(...SEEDS.slice(0, 4)), fc.array(fc.nat(), { minLength: 1, maxLength: 5 }), weirdValue, fc.boolean(), async (seed, path, v, asJson) => {
        const data = setAt(parse(seed), path, v);
        let text: string;
        try {
          text = asJson ? JSON.stringify(data) ?? 'null' : stringify(data);
        } catch {
          text = stringify(data);
        }
        await run(text);
      }),
      { numRuns: 3500 },
    );
  });

  it('returns a typed result for random YAML and random text', async () => {
    await fc.assert(
      fc.asyncProperty(
        fc.oneof(
          fc.anything({ maxDepth: 4 }).map((v) => stringify(v) ?? ''),
          fc.jsonValue({ maxDepth: 4 }).map((v) => JSON.stringify(v)),
          fc.array(YAML_NOISE, { maxLength: 30 }).map((a) => a.join('')),
          fc.string({ maxLength: 200 }),
        ),
        async (text) => run(text),
      ),
      { numRuns: 2500 },
    );
  });

  it('returns a typed result for deep nesting and alias tricks', async () => {
    await fc.assert(
      fc.asyncProperty(fc.integer({ min: 1, max: 300 }), fc.constantFrom('[', '{a: ', '- ', 'k:\n'), async (depth, opener) => {
        const closer = opener === '[' ? ']' : opener === '{a: ' ? '}' : '';
        const indentBlock = opener === 'k:\n' ? Array.from({ length: depth }, (_, i) => ' '.repeat(i) + 'k:').join('\n') : '';
        const nested = indentBlock || opener.repeat(depth) + '1' + closer.repeat(depth);
        await run(SEEDS[0] + `description: ${nested.includes('\n') ? '\n' + nested.replace(/^/gm, '  ') : nested}\n`);
        await run(nested);
        await run(`a: &a [*a, *a]\nb: &b [*a, *a, *a]\nc: [*b, *b, *b]\n`.repeat(1 + (depth % 3)));
      }),
      { numRuns: 500 },
    );
  });
});
