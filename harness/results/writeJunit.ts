// junit.xml, the test report every CI system reads: one <testsuite> per build, one <testcase> per
// scenario; acceptance failures as <failure> with the reasons, error runs as <error>.

import { XMLBuilder } from 'fast-xml-parser';
import { writeFileAtomicSync } from '../files/atomic.js';
import { xmlSafeTree } from '../files/xml.js';
import { runsByBuild } from './buildOrder.js';
import type { ResultsFile, RunResult } from './types.js';

type XmlNode = Record<string, unknown>;

/**
 * How each failing run compares with the gate's baseline, keyed `scenario id \0 build`: a CI test
 * view then tells a failure the candidate introduced from one it inherited. Given by the caller
 * (the gate lives above this layer); runs not in it are marked by their own status only.
 */
export type JunitRunChanges = ReadonlyMap<string, 'new-failure' | 'still-failing' | 'fixed' | 'passing'>;

export function junitRunKey(scenarioId: string, build: string): string {
  return `${scenarioId}\u0000${build}`;
}

const CHANGE_PREFIX: Record<string, string> = { 'new-failure': 'new failure: ', 'still-failing': 'still failing (fails on the baseline too): ' };

function seconds(value: number): string {
  return value.toFixed(3);
}

function brief(run: RunResult): string {
  const m = run.metrics;
  if (m === null) return 'no metrics (the run produced no ticks)';
  const fixed = (v: number | null, d: number) => (v === null ? 'n/a' : v.toFixed(d));
  return [
    `friction margin min ${fixed(m.frictionMargin.min, 3)}, p05 ${fixed(m.frictionMargin.p05, 3)}`,
    ...(m.stanceMargin ? [`stance margin min ${fixed(m.stanceMargin.min, 3)}, p05 ${fixed(m.stanceMargin.p05, 3)}`] : []),
    `slip distance ${m.slipDistance_m.toFixed(4)} m`,
    ...(m.touchdown ? [`${m.touchdown.count} touchdowns, slip per touchdown mean ${fixed(m.touchdown.slip_m.mean, 6)} m, p95 ${fixed(m.touchdown.slip_m.p95, 6)} m`] : []),
    `commanded violations ${m.violations.commanded}`,
    m.fell ? `fell at ${fixed(m.fellAt_s, 3)} s` : 'did not fall',
    `loop time p99 ${fixed(m.loopTime_us.p99, 1)} us`,
  ].join('; ');
}

function testcase(run: RunResult, changes?: JunitRunChanges): XmlNode {
  const change = changes?.get(junitRunKey(run.scenario.id, run.build));
  const prefix = change === undefined ? '' : (CHANGE_PREFIX[change] ?? '');
  const node: XmlNode = {
    '@_name': run.scenario.id,
    '@_classname': run.build,
    '@_file': run.scenario.file,
    '@_time': seconds(run.sim?.wall_s ?? 0),
  };
  if (run.status === 'fail') {
    const type = change === 'still-failing' ? 'acceptance-still-failing' : change === 'new-failure' ? 'acceptance-new-failure' : 'acceptance';
    node.failure = { '@_message': prefix + run.reasons.join('; '), '@_type': type, '#text': run.reasons.join('\n') };
  } else if (run.status === 'error') {
    const error = run.error ?? { message: run.reasons.join('; ') };
    node.error = {
      '@_message': prefix + error.message,
      '@_type': `${error.reason ?? 'error'}${change === 'still-failing' ? '-still-failing' : change === 'new-failure' ? '-new-failure' : ''}`,
      '#text': error.stderrTail ?? run.reasons.join('\n'),
    };
  }
  node['system-out'] = `${run.scenario.title}\n${brief(run)}`;
  return node;
}

export function renderJunitXml(results: ResultsFile, changes?: JunitRunChanges): string {
  const suites: XmlNode[] = [];
  let tests = 0;
  let failures = 0;
  let errors = 0;
  let time_s = 0;
  for (const [build, runs] of runsByBuild(results)) {
    const manifest = results.builds.find((b) => b.name === build);
    const suiteFailures = runs.filter((r) => r.status === 'fail').length;
    const suiteErrors = runs.filter((r) => r.status === 'error').length;
    const suiteTime_s = runs.reduce((sum, r) => sum + (r.sim?.wall_s ?? 0), 0);
    tests += runs.length;
    failures += suiteFailures;
    errors += suiteErrors;
    time_s += suiteTime_s;
    const properties: XmlNode[] = [];
    for (const key of ['kind', 'entry', 'commit', 'dirty'] as const) {
      const value = manifest?.[key];
      if (value !== undefined && value !== null) properties.push({ '@_name': key, '@_value': String(value) });
    }
    const suite: XmlNode = {
      '@_name': build,
      '@_tests': runs.length,
      '@_failures': suiteFailures,
      '@_errors': suiteErrors,
      '@_skipped': 0,
      '@_time': seconds(suiteTime_s),
      '@_timestamp': results.startedAt,
    };
    if (properties.length > 0) suite.properties = { property: properties };
    suite.testcase = runs.map((run) => testcase(run, changes));
    suites.push(suite);
  }
  const builder = new XMLBuilder({
    ignoreAttributes: false,
    attributeNamePrefix: '@_',
    format: true,
    indentBy: '  ',
    suppressEmptyNode: true,
    // Default true writes value="true" as a bare `value`, which is not XML (only HTML has boolean attributes).
    suppressBooleanAttributes: false,
  });
  const document = {
    '?xml': { '@_version': '1.0', '@_encoding': 'UTF-8' },
    testsuites: {
      '@_name': 'footing',
      '@_tests': tests,
      '@_failures': failures,
      '@_errors': errors,
      '@_time': seconds(time_s),
      testsuite: suites,
    },
  };
  // Build-supplied text (stderr, messages) may hold characters XML 1.0 cannot (harness/text/xml.ts).
  return builder.build(xmlSafeTree(document)) as string;
}

export function writeJunitXml(file: string, results: ResultsFile, changes?: JunitRunChanges): void {
  writeFileAtomicSync(file, renderJunitXml(results, changes));
}
