// Build specs from the command line: the three forms, options, quoting, and errors that name the
// spec and say what was expected.

import { describe, expect, it } from 'vitest';
import { BuildSpecError, parseBuildSpec, splitArguments } from '../../../harness/builds/spec.js';

const CWD = '/home/user/robot';

function problemOf(text: string): string {
  try {
    parseBuildSpec(text, CWD);
  } catch (error) {
    expect(error).toBeInstanceOf(BuildSpecError);
    expect((error as BuildSpecError).specText).toBe(text);
    return (error as Error).message;
  }
  throw new Error(`'${text}' parsed without error`);
}

describe('parseBuildSpec', () => {
  it('reads name=path as an in-process module, resolved against the working directory', () => {
    const spec = parseBuildSpec('tip=builds/controller.js', CWD);
    expect(spec).toEqual({
      name: 'tip',
      kind: 'module',
      entry: '/home/user/robot/builds/controller.js',
      args: [],
      options: {},
      cwd: CWD,
      text: 'tip=builds/controller.js',
    });
  });

  it('accepts TypeScript modules and absolute paths', () => {
    expect(parseBuildSpec('b=/opt/ctl/main.ts', CWD).entry).toBe('/opt/ctl/main.ts');
    expect(parseBuildSpec('b=./x.mts', CWD).entry).toBe('/home/user/robot/x.mts');
  });

  it('reads options after ? as typed key=value pairs, URL-decoded', () => {
    const spec = parseBuildSpec('cand=ctl.js?gain=2.5&verbose=true&label=left%20leg&n=-3&e=1e-3&id=007x', CWD);
    expect(spec.options).toEqual({ gain: 2.5, verbose: true, label: 'left leg', n: -3, e: 0.001, id: '007x' });
  });

  it('reads exec: specs as a program and arguments split without a shell', () => {
    const spec = parseBuildSpec(`py=exec:python3 ctl.py --gain 2 'two words' "say \\"hi\\"" a\\ b`, CWD);
    expect(spec.kind).toBe('process');
    expect(spec.entry).toBe('python3');
    expect(spec.args).toEqual(['ctl.py', '--gain', '2', 'two words', 'say "hi"', 'a b']);
  });

  it('resolves a relative program path but leaves a bare command name for PATH lookup', () => {
    expect(parseBuildSpec('c=exec:./bin/ctl', CWD).entry).toBe('/home/user/robot/bin/ctl');
    expect(parseBuildSpec('c=exec:ctl-server --port 0', CWD).entry).toBe('ctl-server');
  });

  it('takes a final unquoted ?token of an exec: spec as options, a quoted one as an argument', () => {
    const withOptions = parseBuildSpec('c=exec:prog a ?k=1&m=x', CWD);
    expect(withOptions.args).toEqual(['a']);
    expect(withOptions.options).toEqual({ k: 1, m: 'x' });
    const quoted = parseBuildSpec(`c=exec:prog a '?k=1'`, CWD);
    expect(quoted.args).toEqual(['a', '?k=1']);
    expect(quoted.options).toEqual({});
  });

  it('reads ref:<id> with the id as the default name, and name=ref:<id>', () => {
    for (const id of ['nominal', 'governed', 'clamped', 'qp', 'overtrusting']) {
      const spec = parseBuildSpec(`ref:${id}`, CWD);
      expect(spec).toMatchObject({ name: id, kind: 'reference', entry: id, args: [] });
    }
    expect(parseBuildSpec('baseline=ref:qp?margin=0.1', CWD)).toMatchObject({
      name: 'baseline',
      kind: 'reference',
      entry: 'qp',
      options: { margin: 0.1 },
    });
  });

  it('rejects specs that fit no form, saying which forms exist', () => {
    expect(problemOf('controller.js')).toMatch(/no build name; expected name=path\/to\/module.js, name=exec:program/);
    expect(problemOf('')).toMatch(/empty spec/);
    expect(problemOf('=x.js')).toMatch(/empty build name/);
    expect(problemOf('tip=')).toMatch(/nothing after 'tip='/);
  });

  it('rejects build names outside [A-Za-z0-9._-]', () => {
    expect(problemOf('my build=x.js')).toMatch(/build name 'my build' may contain only letters, digits/);
    expect(problemOf('a/b=x.js')).toMatch(/build name 'a\/b'/);
  });

  it('rejects unknown reference ids, listing the known ones', () => {
    expect(problemOf('ref:fancy')).toMatch(/unknown reference build 'fancy' \(expected one of nominal, governed, clamped, qp, overtrusting\)/);
    // A near miss gets a did-you-mean.
    expect(problemOf('ref:governd')).toMatch(/unknown reference build 'governd'; did you mean 'ref:governed'\?/);
  });

  it('rejects a module without a module extension, pointing to exec:', () => {
    expect(problemOf('cpp=build/controller')).toMatch(/must end in \.js, \.mjs, \.cjs, \.ts, \.mts, \.cts; for a program in another language write cpp=exec:/);
  });

  it('rejects broken options and quoting', () => {
    expect(problemOf('a=x.js?gain')).toMatch(/option 'gain' must be key=value/);
    expect(problemOf('a=x.js?k=1&k=2')).toMatch(/option 'k' is given twice/);
    expect(problemOf('a=x.js?1k=2')).toMatch(/option key '1k'/);
    expect(problemOf('a=x.js?k=%E0%A4%A')).toMatch(/broken %-escape/);
    expect(problemOf(`a=exec:prog 'open`)).toMatch(/unterminated ' quote/);
    expect(problemOf('a=exec:prog "open')).toMatch(/unterminated " quote/);
    expect(problemOf('a=exec:')).toMatch(/exec: needs a program/);
    expect(problemOf('a=exec:?k=1')).toMatch(/exec: needs a program/);
  });
});

describe('splitArguments', () => {
  const fail = (problem: string): never => {
    throw new Error(problem);
  };

  it('keeps empty quoted arguments and collapses runs of whitespace', () => {
    expect(splitArguments(`a   ''  "" \tb`, fail).map((t) => t.value)).toEqual(['a', '', '', 'b']);
  });

  it('joins adjacent quoted and unquoted parts into one argument, as a shell does', () => {
    expect(splitArguments(`--name='x y'z`, fail).map((t) => t.value)).toEqual(['--name=x yz']);
  });
});
