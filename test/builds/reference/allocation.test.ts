// A control tick (and a governor update alone) allocates nothing, for every reference build
// except qp (its solver library, quadprog, allocates work arrays on every call).
//
// Each build is measured in a fresh process with on-stack replacement off
// (fixtures/allocationProbe.ts through test/support/allocationProbe.ts, which says why), as a
// real run gives each build spec its own run thread. What was seen without that: in one process, a
// governed build's 5.5·10⁵ governor-only updates followed by the over-trusting build's ticks left
// the ERG's `update3x6` unoptimised in about half the tries; alone but under machine load, an OSR
// compile racing a deoptimisation left it in baseline code for good (1.5 kB per update, 183
// collections) in 2 of 5 fresh processes, 0 of 8 with `--no-use-osr`.

import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { runAllocationProbe } from '../../support/allocationProbe.js';

const PROBE = fileURLToPath(new URL('./fixtures/allocationProbe.ts', import.meta.url));
const probe = (id: string, mode: 'tick' | 'governorUpdate') => runAllocationProbe(PROBE, [id, mode]);

describe('reference builds allocate nothing per tick', () => {
  it('governed: a governor update alone allocates nothing', async () => {
    const result = await probe('governed', 'governorUpdate');
    expect(result.collections).toBe(0);
    expect(result.bytesPerCall).toBeLessThan(6); // see the bound below
  }, 60_000);

  for (const id of ['nominal', 'clamped', 'governed', 'overtrusting']) {
    it(`${id}: a tick allocates nothing`, async () => {
      const result = await probe(id, 'tick');
      // The smallest per-tick allocation V8 can make is one heap number (16 B on this 64-bit
      // build, 12 B with pointer compression), so anything allocating every tick shows ≥ 12 B per
      // tick. We allow < 6 B: one-off re-optimisation garbage (code and feedback objects) spread
      // over 2e5 ticks has been measured at ≈ 0.1 B per tick.
      expect(result.collections).toBe(0);
      expect(result.bytesPerCall).toBeLessThan(6);
    }, 60_000);
  }
});
