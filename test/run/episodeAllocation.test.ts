// The episode loop (sensing, commands, build call, action hold, physics steps, scorer) allocates
// nothing per tick. A double passed to a call V8 does not inline is a heap number (DEVELOPERS.md);
// the command schedule once took the plant's time and the control period as arguments and so
// allocated two per tick (about 30 bytes), which the scorer and plant probes could not see.

import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { runAllocationProbe } from '../support/allocationProbe.js';

describe('the episode loop', () => {
  it('allocates nothing per control tick', async () => {
    const result = await runAllocationProbe(fileURLToPath(new URL('./probes/episodeAllocation.ts', import.meta.url)));
    // 60 000 extra ticks (60 s at the walk's 1 kHz): one 12-byte heap number per tick would be
    // 720 kB of growth and, with the young generation's few MB, scavenges in the long run.
    expect(result.bytesPerCall).toBeLessThan(1);
    expect(result.collections).toBe(0);
  }, 60_000);
});
