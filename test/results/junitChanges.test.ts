import { XMLParser, XMLValidator } from 'fast-xml-parser';
import { describe, expect, it } from 'vitest';
import { junitRunKey, renderJunitXml } from '../../harness/results/writeJunit.js';
import { sampleResults } from './fixtures.js';

describe('junit.xml marks failures the candidate inherited apart from new ones', () => {
  it('types a still-failing run distinctly and says so in its message', () => {
    const results = sampleResults();
    const failing = results.runs.filter((r) => r.status === 'fail');
    expect(failing.length).toBeGreaterThanOrEqual(1);
    const changes = new Map([[junitRunKey(failing[0].scenario.id, failing[0].build), 'still-failing' as const]]);
    const xml = renderJunitXml(results, changes);
    expect(XMLValidator.validate(xml)).toBe(true);
    const parsed = new XMLParser({ ignoreAttributes: false }).parse(xml);
    const cases = [parsed.testsuites.testsuite].flat().flatMap((s: { testcase: unknown }) => [s.testcase].flat()) as Record<string, { '@_type': string; '@_message': string }>[];
    const marked = cases.find((c) => (c as unknown as Record<string, string>)['@_name'] === failing[0].scenario.id && (c as unknown as Record<string, string>)['@_classname'] === failing[0].build)!;
    expect(marked.failure['@_type']).toBe('acceptance-still-failing');
    expect(marked.failure['@_message']).toMatch(/^still failing \(fails on the baseline too\): /);
    // Without gate information the plain type stays.
    expect(renderJunitXml(results)).toContain('type="acceptance"');
  });
});
