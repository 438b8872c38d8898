// The demo log is reproducible: the generator, run again, writes the committed files byte for byte.

import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { makeDemoLog } from '../../examples/recorded/make-demo-log.js';
import { DEMO_CSV, DEMO_MCAP, tempDir } from './support.js';

describe('demo log generator', () => {
  it('writes the committed CSV and MCAP files again, byte for byte', async () => {
    const made = await makeDemoLog(tempDir('demo'));
    expect(readFileSync(made.csv).equals(readFileSync(DEMO_CSV))).toBe(true);
    expect(readFileSync(made.mcap).equals(readFileSync(DEMO_MCAP))).toBe(true);
    expect(readFileSync(made.csv, 'utf8')).toMatch(/^# INVENTED demo log/);
  });
});
