import { describe, expect, it } from 'vitest';
import { strictJsonProblem } from '../../harness/files/source.js';
import { BASE_YAML, load } from '../scenario/helpers.js';
import { parse } from 'yaml';

describe('a .json scenario is strict JSON', () => {
  it('refuses a trailing comma with its line and column, where YAML would accept it', async () => {
    const json = JSON.stringify(parse(BASE_YAML), null, 2).replace(/\n}$/, ',\n}');
    const r = await load(json, {}, '/suite/s.json');
    expect(r.ok).toBe(false);
    if (r.ok) return;
    const lines = json.split('\n').length;
    expect(r.errors[0]).toMatchObject({ line: lines, column: 1 });
    expect(r.errors[0].message).toMatch(/^JSON syntax: .*strict JSON/);
    // The same text under a .yaml name loads: YAML's flow syntax allows the comma.
    expect((await load(json, {}, '/suite/s.yaml')).ok).toBe(true);
  });

  it('accepts valid JSON and names the position of the first problem otherwise', () => {
    expect(strictJsonProblem('{"a": [1, 2]}')).toBeNull();
    expect(strictJsonProblem('{"a": 1,\n // note\n "b": 2}')).toMatchObject({ line: 2, column: 2 });
    expect(strictJsonProblem("{'a': 1}")).toMatchObject({ line: 1, column: 2 });
  });
});
