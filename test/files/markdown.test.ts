// Build-supplied text in our Markdown (harness/files/markdown.ts) stays one inert line: rendered by
// the CommonMark reference parser (npm `commonmark`) it forms no heading, image, link, emphasis,
// code span or raw HTML, and no @-mention, whatever the text.
import { HtmlRenderer, Parser } from 'commonmark';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { renderGateMarkdown } from '../../harness/gate/render.js';
import type { GateOutcome } from '../../harness/gate/types.js';
import { markdownCode, markdownInline } from '../../harness/files/markdown.js';

const render = (markdown: string) => new HtmlRenderer().render(new Parser().parse(markdown));
/** The text a renderer shows for `html` once tags are gone and the few entities it writes are decoded. */
const shown = (html: string) => html.replace(/<[^>]*>/g, '').replace(/&lt;/g, '<').replace(/&gt;/g, '>').replace(/&quot;/g, '"').replace(/&amp;/g, '&').trim();

const HOSTILE = [
  '\n### ✅ hold\n',
  '![x](https://example.invalid/pixel.png)',
  '<img src="https://example.invalid/p.png">',
  'ping @reviewer and @team/leads',
  '[click](javascript:alert(1)) *bold* _em_ `code` ~~gone~~ | cell | &#64;entity &amp;',
];

describe('markdownInline', () => {
  it.each(HOSTILE)('renders %j as a plain paragraph of the same text', (text) => {
    const html = render(`- x: ${markdownInline(text)}`);
    expect(html).not.toMatch(/<(h\d|img|a|em|strong|code|del)\b/);
    expect(html.match(/<p>|<li>/g)?.length ?? 0).toBeLessThanOrEqual(1);
    const squeeze = (t: string) => t.replace(/\u200D/g, '').replace(/\s+/g, ' ').trim();
    expect(squeeze(shown(html))).toBe(squeeze(`x: ${text}`));
  });

  it('never lets a tag, heading, image or link through, for any text', () => {
    fc.assert(
      fc.property(fc.string({ unit: 'grapheme-ascii', maxLength: 80 }), fc.string({ maxLength: 20 }), (ascii, other) => {
        const text = ascii + other;
        const html = render(`- x: ${markdownInline(text)}`);
        expect(html).not.toMatch(/<(h\d|img|a|em|strong|code|del|script|div|span|br)\b/);
        // One list item, no second block: line breaks could not start one.
        expect(html.match(/<li>/g)).toHaveLength(1);
        // No mention: every @ is followed by the zero-width joiner.
        expect(markdownInline(text)).not.toMatch(/@(?!\u200D)/);
      }),
      { numRuns: 500 },
    );
  });

  it('markdownCode keeps a name inside its code span (an empty name reads "(unnamed)")', () => {
    expect(markdownCode(' ')).toBe('(unnamed)');
    fc.assert(
      fc.property(fc.string({ maxLength: 30 }).filter((name) => name.trim() !== ''), (name) => {
        const html = render(`- ${markdownCode(name)} done`);
        expect(html.match(/<code>/g)).toHaveLength(1);
        expect(html).toMatch(/<\/code> done<\/li>/);
      }),
    );
  });
});

describe('gate.md with hostile text from a results file', () => {
  it('shows the block headline only, however the reasons, warnings and names are crafted', () => {
    const hostile = HOSTILE.join(' ');
    const outcome = {
      verdict: 'block',
      compared: 1,
      buildPairs: [['base', 'cand`\n### ✅ hold']],
      rows: [{ scenario: 'walk', baselineBuild: 'base', candidateBuild: 'cand', metric: 'slipDistance_m', baseline: 0.01, candidate: 0.2, change: hostile, rule: hostile, broken: true, blocking: true, reason: hostile }],
      runChanges: { 'new-failure': 0, 'still-failing': 0, fixed: 0, passing: 1 },
      notComparable: [{ scenario: 'x\n# fake', baselineBuild: 'base', candidateBuild: 'cand', reason: hostile }],
      unpaired: [{ side: 'candidate', build: 'b\n## fake', scenario: null, reason: hostile }],
      warnings: [hostile],
    } as unknown as GateOutcome;
    const html = render(renderGateMarkdown(outcome));
    expect(html.match(/<h\d>/g)).toEqual(['<h3>']);
    expect(html).toMatch(/<h3>Footing gate: ❌ block/);
    expect(html).not.toMatch(/<(img|a)\b/);
    expect(html).not.toMatch(/@(?!\u200D)[a-z]/);
  });
});
