// Text for XML 1.0 (harness/files/xml.ts): whatever a build writes (ANSI escapes, NUL, lone
// surrogates), junit.xml stays a well-formed XML 1.0 document for a strict parser
// (fast-xml-parser's XMLValidator), and printable text comes back unchanged.
import fc from 'fast-check';
import { XMLParser, XMLValidator } from 'fast-xml-parser';
import { describe, expect, it } from 'vitest';
import { renderJunitXml } from '../../harness/results/writeJunit.js';
import type { ResultsFile, RunResult } from '../../harness/results/types.js';
import { xmlSafeText } from '../../harness/files/xml.js';

function resultsWith(text: string): ResultsFile {
  const run = {
    scenario: { id: 'walk', revision: 1, hash: 'h', file: 'scenarios/walk.yaml', title: text },
    build: 'b',
    status: 'error',
    reasons: [text],
    error: { message: text, reason: text, stderrTail: `\u001b[31m${text}\u001b[0m` },
    sim: null,
    metrics: null,
  } as RunResult;
  return {
    format: 'footing-results',
    formatVersion: 2,
    toolVersion: '0',
    startedAt: '2026-01-01T00:00:00.000Z',
    machine: { cores: 1, nodeVersion: 'v20', platform: 'linux', arch: 'x64', cpuModel: text },
    builds: [{ name: 'b', kind: 'module', entry: text, commit: text, dirty: true }],
    runs: [run, { ...run, status: 'fail', error: undefined }],
  } as ResultsFile;
}

describe('junit.xml with hostile build text', () => {
  it('an ANSI escape in stderr yields a document a strict XML parser accepts, the escape written as \\x1B', () => {
    const xml = renderJunitXml(resultsWith('boom'));
    expect(XMLValidator.validate(xml)).toBe(true);
    expect(xml).toContain('\\x1B[31mboom\\x1B[0m');
  });

  it('is well-formed for any string in every field, and printable text survives unchanged', () => {
    fc.assert(
      fc.property(fc.string({ unit: 'binary', maxLength: 60 }), (text) => {
        const xml = renderJunitXml(resultsWith(text));
        expect(XMLValidator.validate(xml)).toBe(true);
      }),
      { numRuns: 300 },
    );
    fc.assert(
      fc.property(fc.string({ unit: 'grapheme', maxLength: 40 }).filter((t) => t.trim() === t && !/[\u0000-\u001F\uFFFE\uFFFF]/.test(t)), (text) => {
        const parsed = new XMLParser({ ignoreAttributes: false, trimValues: false }).parse(renderJunitXml(resultsWith(text)));
        const testcase = [parsed.testsuites.testsuite.testcase].flat()[0];
        expect(String(testcase.error['@_message'])).toBe(text === '' ? '' : String(new XMLParser({ ignoreAttributes: false, trimValues: false }).parse(`<a m="${text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/"/g, '&quot;')}"/>`).a['@_m']));
      }),
    );
  });

  it('xmlSafeText leaves legal characters alone and names each illegal one', () => {
    expect(xmlSafeText('tab\tnew\nline é 😀')).toBe('tab\tnew\nline é 😀');
    expect(xmlSafeText('\u0000\u0007\u001b\uFFFE')).toBe('\\x00\\x07\\x1B\\uFFFE');
    expect(xmlSafeText('a\uD800b\uDFFFc')).toBe('a\\uD800b\\uDFFFc');
  });
});
