import { mkdirSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { printConfig } from '../../harness/commands/config.js';
import { DEFAULT_BUILDS, DEFAULT_OUT_DIR } from '../../harness/config/defaults.js';
import { expandGlob, globToRegExp } from '../../harness/config/glob.js';
import { ConfigError, loadConfig } from '../../harness/config/load.js';
import { resolveSettings, SettingsError } from '../../harness/config/resolve.js';
import { EXIT } from '../../harness/commands/exit.js';

/** A project folder holding `config` as footing.config.yaml and a scenarios/ folder with two files. */
function project(config: string | null): string {
  const dir = mkdtempSync(path.join(tmpdir(), 'footing-config-'));
  mkdirSync(path.join(dir, 'scenarios', 'ice'), { recursive: true });
  writeFileSync(path.join(dir, 'scenarios', 'stand-a.yaml'), 'x: 1\n');
  writeFileSync(path.join(dir, 'scenarios', 'ice', 'stand-b.yaml'), 'x: 1\n');
  writeFileSync(path.join(dir, 'scenarios', 'walk.yaml'), 'x: 1\n');
  if (config !== null) writeFileSync(path.join(dir, 'footing.config.yaml'), config);
  return dir;
}

function configErrors(config: string): string[] {
  const dir = project(config);
  try {
    loadConfig(path.join(dir, 'footing.config.yaml'), dir);
  } catch (error) {
    if (error instanceof ConfigError) return error.message.split('\n');
    throw error;
  }
  throw new Error('expected the config to be refused');
}

function settingsErrors(config: string | null, flags: Parameters<typeof resolveSettings>[0] = {}): string[] {
  const dir = project(config);
  try {
    resolveSettings({ ...flags, cwd: dir });
  } catch (error) {
    if (error instanceof SettingsError || error instanceof ConfigError) return error.message.split('\n');
    throw error;
  }
  throw new Error('expected the settings to be refused');
}

const GOOD = `version: 1
suites:
  nightly: [scenarios]
  merge:
    scenarios: ["scenarios/**/stand-*.yaml"]
    builds: [governed, candidate]
    baseline: governed
builds:
  governed: ref:governed
  candidate: ref:overtrusting
jobs: 3
out: out/footing
`;

describe('footing.config.yaml: validation with file, line, path and did-you-mean', () => {
  it('names an unknown top-level key at its line and suggests the near one', () => {
    const lines = configErrors('version: 1\nbaselin: main\n');
    expect(lines).toEqual(['footing.config.yaml:2:1: baselin: unknown key; did you mean "baseline"?']);
  });

  it('names an unknown key inside a git build and suggests the near one', () => {
    const lines = configErrors('builds:\n  main:\n    ref: main\n    entyr: dist/c.mjs\n');
    expect(lines.join('\n')).toContain('footing.config.yaml:4:5: builds.main.entyr: unknown key; did you mean "entry"?');
  });

  it('names a value of the wrong type with what was expected', () => {
    const lines = configErrors('jobs: two\n');
    expect(lines).toEqual(['footing.config.yaml:1:7: jobs: "two" is a string, expected an integer']);
  });

  it('refuses jobs below 1 and an empty suite', () => {
    const lines = configErrors('jobs: 0\nsuites:\n  nightly: []\n');
    expect(lines).toContain('footing.config.yaml:1:7: jobs: 0 is out of range (expected ≥ 1)');
    expect(lines).toContain('footing.config.yaml:3:12: suites.nightly: is an empty list (expected at least 1 item)');
  });

  it('names a suite build that is not in the builds section, with did-you-mean', () => {
    const lines = configErrors('builds:\n  main: ref:governed\nsuites:\n  merge:\n    scenarios: [scenarios]\n    builds: [mian]\n');
    expect(lines).toEqual(['footing.config.yaml:6:14: suites.merge.builds.0: no build "mian" in the builds section; did you mean "main"?']);
  });

  it('names a baseline that is not a build, listing the builds when none is near', () => {
    const lines = configErrors('builds:\n  main: ref:governed\n  candidate: ref:qp\nbaseline: mainline\n');
    expect(lines).toEqual(['footing.config.yaml:4:11: baseline: no build "mainline" in the builds section; known: main, candidate']);
  });

  it('names a malformed build spec with the parser\'s reason', () => {
    const lines = configErrors('builds:\n  odd: controller.py\n');
    expect(lines[0]).toMatch(/^footing\.config\.yaml:2:8: builds\.odd: module 'controller\.py' must end in \.js/);
  });

  it('says a git:REF build needs the git section\'s entry', () => {
    const lines = configErrors('builds:\n  main: git:main\n');
    expect(lines[0]).toMatch(/^footing\.config\.yaml:2:9: builds\.main: "git:main" needs the git section's entry/);
  });

  it('locates an unknown key of an inline gate policy in the config file', () => {
    const lines = configErrors('gate:\n  frictionMarginMinLos: 0.05\n');
    expect(lines).toEqual(['footing.config.yaml:2:3: gate.frictionMarginMinLos: unknown key; did you mean "frictionMarginMinLoss"?']);
  });

  it('refuses a gate policy path that does not exist', () => {
    const lines = configErrors('gate: policy/missing.yaml\n');
    expect(lines[0]).toMatch(/^footing\.config\.yaml:1:7: gate: policy file "policy\/missing\.yaml" does not exist/);
  });

  it('reports YAML syntax errors with their position', () => {
    const lines = configErrors('suites:\n  nightly: [scenarios\n');
    expect(lines[0]).toMatch(/^footing\.config\.yaml:\d+:\d+: \(top level\): YAML: /);
  });

  it('accepts the documented example and parses an inline policy over the defaults', () => {
    const dir = project(`${GOOD}gate:\n  frictionMarginMinLoss: 0.05\n`);
    const config = loadConfig(path.join(dir, 'footing.config.yaml'), dir);
    expect(config.inlinePolicy?.rules.frictionMarginMinLoss).toBe(0.05);
    // Untouched rules keep the defaults of harness/gate/defaults.ts.
    expect(config.inlinePolicy?.rules.frictionMarginP05Loss).toBe(0.02);
  });
});

describe('settings: flags over the file over defaults', () => {
  it('takes builds, baseline and scenarios from the named suite, paths relative to the config file', () => {
    const dir = project(GOOD);
    const s = resolveSettings({ suite: 'merge', cwd: dir });
    expect(s.builds.map((b) => b.name)).toEqual(['governed', 'candidate']);
    expect(s.baseline).toMatchObject({ value: 'governed', origin: { from: 'file', path: 'suites.merge.baseline', line: 7 } });
    // The glob matches stand-a and ice/stand-b, not walk.yaml.
    expect(s.paths.value.map((p) => path.relative(dir, p))).toEqual([path.join('scenarios', 'ice', 'stand-b.yaml'), path.join('scenarios', 'stand-a.yaml')]);
    expect(s.jobs).toMatchObject({ value: 3, origin: { from: 'file', line: 11 } });
    expect(s.out.value).toBe(path.join(dir, 'out', 'footing'));
  });

  it('lets flags override the file, and says so', () => {
    const dir = project(GOOD);
    const s = resolveSettings({ suite: 'merge', cwd: dir, jobs: 1, out: 'elsewhere', builds: ['governed', 'x=ref:qp'], baseline: 'x' });
    expect(s.jobs).toEqual({ value: 1, origin: { from: 'flag', flag: '--jobs' } });
    expect(s.out.value).toBe(path.join(dir, 'elsewhere'));
    // A bare name on --build picks the config's build; a spec is parsed as on the command line.
    expect(s.builds.map((b) => b.name)).toEqual(['governed', 'x']);
    expect(s.baseline.origin).toEqual({ from: 'flag', flag: '--baseline' });
  });

  it('falls back to the defaults without a config file', () => {
    const dir = project(null);
    const s = resolveSettings({ cwd: dir });
    expect(s.config).toBeNull();
    expect(s.builds.map((b) => b.text)).toEqual([...DEFAULT_BUILDS]);
    expect(s.out).toEqual({ value: path.join(dir, DEFAULT_OUT_DIR), origin: { from: 'default' } });
    expect(s.trace).toEqual({ value: false, origin: { from: 'default' } });
  });

  it('drops the file\'s baseline for a shard (the gate runs after the merge)', () => {
    const dir = project(GOOD);
    expect(resolveSettings({ suite: 'merge', cwd: dir, shard: '1/2' }).baseline.value).toBeUndefined();
    expect(resolveSettings({ suite: 'merge', cwd: dir, shard: '1/2', baseline: 'governed' }).baseline.value).toBe('governed');
  });

  it('names an unknown suite with did-you-mean', () => {
    expect(settingsErrors(GOOD, { suite: 'nighlty' })).toEqual(['--suite nighlty: footing.config.yaml has no suite of that name; did you mean "nightly"?']);
  });

  it('says --suite needs a config file when there is none', () => {
    expect(settingsErrors(null, { suite: 'nightly' })[0]).toMatch(/^--suite nightly: suites are defined in footing\.config\.yaml, and there is none in /);
  });

  it('names a --baseline that is not one of the builds', () => {
    expect(settingsErrors(GOOD, { suite: 'merge', baseline: 'candidat' })).toEqual([
      '--baseline: baseline "candidat" is not one of the builds (governed, candidate); did you mean "candidate"?',
    ]);
  });

  it('names a suite entry that matches nothing, at its line', () => {
    const lines = settingsErrors('suites:\n  nightly: [scenarios, "scenarios/*.json", missing.yaml]\n', { suite: 'nightly' });
    expect(lines).toEqual([
      'footing.config.yaml:2:24: suites.nightly.1: "scenarios/*.json" matches no file (relative to .)',
      'footing.config.yaml:2:44: suites.nightly.2: "missing.yaml" does not exist (looked for missing.yaml)',
    ]);
  });

  it('says a --build NAME=git:REF needs the git recipe of a config file', () => {
    expect(settingsErrors(null, { builds: ['main=git:main'] })[0]).toMatch(/^--build main=git:main: git:main needs a recipe: set git: \{ build: …, entry: … \}/);
  });
});

describe('footing config --print', () => {
  it('shows every resolved value with where it came from', async () => {
    const dir = project(GOOD);
    const outcome = await printConfig({ suite: 'merge', cwd: dir, jobs: 1 });
    expect(outcome.exitCode).toBe(EXIT.pass);
    const text = outcome.lines.join('\n');
    expect(text).toContain('config file: footing.config.yaml');
    expect(text).toMatch(/^suite\s+merge\s+\[flag --suite\]$/m);
    expect(text).toMatch(/^jobs\s+1\s+\[flag --jobs\]$/m);
    expect(text).toMatch(/^out\s+out\/footing\s+\[file footing\.config\.yaml:12:6 out\]$/m);
    expect(text).toMatch(/^trace\s+false\s+\[default\]$/m);
    expect(text).toMatch(/^baseline\s+governed\s+\[file footing\.config\.yaml:7:15 suites\.merge\.baseline\]$/m);
    expect(text).toMatch(/^ {2}candidate\s+ref:overtrusting\s+\[file footing\.config\.yaml:10:14 builds\.candidate\]$/m);
  });

  it('prints JSON with an origin per value', async () => {
    const dir = project(GOOD);
    const outcome = await printConfig({ cwd: dir, trace: true }, { json: true });
    const json = JSON.parse(outcome.lines.join('\n'));
    expect(json.settings.trace).toEqual({ value: true, origin: { from: 'flag', flag: '--trace' } });
    expect(json.settings.jobs.origin).toMatchObject({ from: 'file', path: 'jobs' });
    expect(json.builds.map((b: { name: string }) => b.name)).toEqual(['governed', 'candidate']);
  });

  it('exits 2 with the config error lines', async () => {
    const dir = project('jobz: 2\n');
    const outcome = await printConfig({ cwd: dir });
    expect(outcome.exitCode).toBe(EXIT.badInput);
    expect(outcome.lines).toEqual(['footing.config.yaml:1:1: jobz: unknown key; did you mean "jobs"?']);
  });
});

describe('suite globs', () => {
  it('matches * within a segment, ** across folders and ? for one character', () => {
    expect(globToRegExp('scenarios/*.yaml').test('scenarios/a.yaml')).toBe(true);
    expect(globToRegExp('scenarios/*.yaml').test('scenarios/ice/a.yaml')).toBe(false);
    expect(globToRegExp('**/stand-?.yaml').test('stand-a.yaml')).toBe(true);
    expect(globToRegExp('**/stand-?.yaml').test('x/y/stand-b.yaml')).toBe(true);
    expect(globToRegExp('**/stand-?.yaml').test('x/stand-bb.yaml')).toBe(false);
  });

  it('expands relative to the base folder, sorted', () => {
    const dir = project(null);
    expect(expandGlob('scenarios/**/*.yaml', dir).map((p) => path.relative(dir, p))).toEqual(
      [path.join('scenarios', 'ice', 'stand-b.yaml'), path.join('scenarios', 'stand-a.yaml'), path.join('scenarios', 'walk.yaml')],
    );
  });
});

describe('the documented examples', () => {
  const firstYamlBlock = (file: string, after: string) => {
    const text = readFileSync(file, 'utf8');
    const from = text.indexOf(after);
    const match = /```yaml\n([\s\S]*?)```/.exec(text.slice(from));
    if (from < 0 || match === null) throw new Error(`no yaml block after "${after}" in ${file}`);
    return match[1];
  };

  it('README.md\'s footing.config.yaml is valid', () => {
    const dir = project(firstYamlBlock('README.md', '### Project config file'));
    const config = loadConfig(path.join(dir, 'footing.config.yaml'), dir);
    expect(Object.keys(config.data.builds ?? {})).toEqual(['main', 'candidate', 'governed']);
  });

  it('docs/config.md\'s full example is valid', () => {
    const dir = project(firstYamlBlock('docs/config.md', '## The keys'));
    mkdirSync(path.join(dir, 'policy'));
    writeFileSync(path.join(dir, 'policy', 'gate.yaml'), 'frictionMarginMinLoss: 0.02\n');
    const config = loadConfig(path.join(dir, 'footing.config.yaml'), dir);
    expect(config.data.loopBudget_us).toBe(1000);
  });
});
