// A stance margin of −2.2e−16 is a foot exactly on its friction cone (1 − |f_t|/(μs·f_n) with
// |f_t| = μs·f_n, one rounding below zero): at three decimals it must read 0.000, not -0.000,
// in gate.md, the terminal table and summary.md. A margin really below zero at that resolution
// keeps its sign.

import { describe, expect, it } from 'vitest';
import { formatGateValue } from '../../harness/gate/render.js';
import { formatFixed } from '../../harness/score/format.js';

describe('numbers that round to zero print without a sign', () => {
  it('formatFixed drops the sign of a rounded zero and keeps a real negative', () => {
    expect(formatFixed(-2.220446049250313e-16, 3)).toBe('0.000');
    expect(formatFixed(-0, 3)).toBe('0.000');
    expect(formatFixed(-0.0004, 3)).toBe('0.000');
    expect(formatFixed(-0.0006, 3)).toBe('-0.001');
    expect(formatFixed(0.448, 3)).toBe('0.448');
  });

  it('the gate tables show a margin on the cone as 0.000', () => {
    expect(formatGateValue('stanceMargin.min', -2.220446049250313e-16)).toBe('0.000');
    expect(formatGateValue('stanceMargin.min', -0.25)).toBe('-0.250');
  });
});
