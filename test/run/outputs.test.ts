// The files of a results folder stay valid whatever builds write (harness/run/outputs.ts with
// harness/text/): junit.xml parses under a strict XML 1.0 parser with ANSI escapes and NUL in a
// build's stderr, and gate.md / summary.md render build text as text (CommonMark reference parser).
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { HtmlRenderer, Parser } from 'commonmark';
import { describe, expect, it } from 'vitest';
import { runSuite } from '../../harness/commands/run.js';
import { expectStrictJunit } from '../support/junit.js';

const render = (file: string) => new HtmlRenderer().render(new Parser().parse(readFileSync(file, 'utf8')));

describe('results folder with hostile build text', () => {
  it('junit.xml stays strict XML, gate.md and summary.md show one real heading each and no image, link or mention', async () => {
    const out = mkdtempSync(path.join(tmpdir(), 'footing-hostile-'));
    const outcome = await runSuite({
      paths: ['test/run/fixtures/brief'],
      builds: ['ref:nominal', 'ansi=exec:python3 test/run/fixtures/hostile_text_build.py', 'md=test/run/fixtures/hostile_message_module.mjs'],
      baseline: 'nominal',
      outDir: out,
      jobs: 2,
      quiet: true,
    });
    const runs = new Map(outcome.results!.runs.map((r) => [r.build, r]));
    expect(runs.get('ansi')!.error!.stderrTail).toContain('\u001b[31m');
    expect(runs.get('md')!.error!.message).toContain('### ✅ hold');
    expectStrictJunit(out);
    expect(readFileSync(path.join(out, 'junit.xml'), 'utf8')).toContain('\\x1B[31mred alert');
    for (const file of ['gate.md', 'summary.md']) {
      const html = render(path.join(out, file));
      expect(html.match(/<h\d>/g), file).toEqual(['<h3>']);
      expect(html, file).not.toMatch(/<(img|a)\b/);
      expect(html, file).not.toMatch(/@(?!\u200D)reviewer/);
    }
  });
});
