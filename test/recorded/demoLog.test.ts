// The demo log is reproducible: the generator, run again, writes the committed files byte for byte;
// its ROS 2 CDR copy imports to the same scenario as the JSON one.

import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { makeDemoLog } from '../../examples/recorded/make-demo-log.js';
import { importLog } from '../../harness/recorded/importLog.js';
import { DEMO_CSV, DEMO_MAP, DEMO_MCAP, tempDir } from './support.js';

describe('demo log generator', () => {
  it('writes the committed CSV and MCAP files again, byte for byte', async () => {
    const made = await makeDemoLog(tempDir('demo'), { cdr: true });
    expect(readFileSync(made.csv).equals(readFileSync(DEMO_CSV))).toBe(true);
    expect(readFileSync(made.mcap).equals(readFileSync(DEMO_MCAP))).toBe(true);
    expect(readFileSync(made.csv, 'utf8')).toMatch(/^# INVENTED demo log/);
    // The CDR copy (ros2msg schemas) imports through the same map to the same scenario hash.
    const fromCdr = await importLog({ log: made.cdrMcap!, map: DEMO_MAP, out: tempDir('cdr-out') });
    const fromJson = await importLog({ log: DEMO_MCAP, map: DEMO_MAP, out: tempDir('json-out') });
    expect(fromCdr.exitCode, fromCdr.lines.join('\n')).toBe(0);
    expect(fromCdr.hash).toBe(fromJson.hash);
  });
});
