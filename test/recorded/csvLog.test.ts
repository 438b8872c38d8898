// The CSV reader's number parser must read every decimal exactly as Number() does (Clinger's fast
// path is exact, longer numbers fall back to Number()), and refuse what is not a decimal.

import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { parseDecimal } from '../../harness/recorded/csvLog.js';

const read = (text: string) => parseDecimal(text, 0, text.length);

describe('parseDecimal', () => {
  it('agrees with Number() bit for bit on decimals as loggers print them', () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true, min: -1e12, max: 1e12 }), fc.integer({ min: 0, max: 9 }), (x, d) => {
        for (const text of [x.toFixed(d), String(x), ` ${x.toFixed(d)} `]) expect(Object.is(read(text), Number(text))).toBe(true);
      }),
      { numRuns: 2000 },
    );
    for (const text of ['0', '-0', '0.1', '.5', '5.', '+3.25', '123456789012345678', '0.30000000000000004', '1e-7', '-2.5E3', '0.000000000000000000000001']) {
      expect(Object.is(read(text), Number(text)), text).toBe(true);
    }
  });

  it('refuses what is not a decimal number', () => {
    for (const text of ['', ' ', '-', '.', 'trot', '0x10', '1,5', '1.2.3', 'Infinity', 'NaN', '1e']) expect(read(text), text).toBeNaN();
  });
});
