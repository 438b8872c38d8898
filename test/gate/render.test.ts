import { describe, expect, it } from 'vitest';
import { GATE_MARKDOWN_LIMIT_chars, renderGateMarkdown, verdictLine } from '../../harness/gate/render.js';
import type { GateOutcome, GateRow } from '../../harness/gate/types.js';

function movedRow(k: number): GateRow {
  return {
    scenario: `scenario-${String(k).padStart(4, '0')}`, baselineBuild: 'main', candidateBuild: 'branch',
    metric: 'trackingRms_m', baseline: 0.01, candidate: 0.011, change: '+0.0010 m', rule: null, broken: false, blocking: false,
  };
}

function outcome(rows: GateRow[]): GateOutcome {
  return {
    verdict: rows.some((r) => r.blocking) ? 'block' : 'hold', rows, notComparable: [], unpaired: [], compared: rows.length,
    runChanges: { 'new-failure': 0, 'still-failing': 0, fixed: 0, passing: rows.length }, buildPairs: [['main', 'branch']], warnings: [],
  };
}

describe('gate.md', () => {
  it('stays under 60,000 characters however many metrics moved, and says where the rest is', () => {
    // 5000 moved rows render to roughly 400 kB uncut.
    const text = renderGateMarkdown(outcome(Array.from({ length: 5000 }, (_, k) => movedRow(k))));
    expect(text.length).toBeLessThan(GATE_MARKDOWN_LIMIT_chars);
    expect(text).toMatch(/cut to stay under 60,000 characters: the full comparison is in report\.html/);
    // The collapsed section is closed even when cut.
    expect(text.split('<details>').length).toBe(text.split('</details>').length);
  });

  it('is not cut when it fits', () => {
    const text = renderGateMarkdown(outcome([movedRow(1)]));
    expect(text).not.toMatch(/cut to stay under/);
    expect(text).toContain('**`scenario-0001`**');
  });

  it('puts the first blocking rule, its scenario and builds in the verdict line', () => {
    const block: GateRow = { ...movedRow(7), metric: 'frictionMargin.min', broken: true, blocking: true, rule: 'loss ≤ 0.02', reason: 'friction margin min fell by 0.031' };
    expect(verdictLine(outcome([block, movedRow(2)]))).toBe('block — scenario-0007 (main → branch): friction margin min fell by 0.031');
  });
});
