import { describe, expect, it } from 'vitest';
import { bisectSearch, maxJudgements, nextProbe, type Verdict } from '../../harness/history/bisect/search.js';
import { SeededRandom } from '../../harness/plant/random.js';

/** A range whose commits from `firstBad` on are bad, with some commits that do not build. */
function oracle(firstBad: number, unbuildable: ReadonlySet<number> = new Set()) {
  const judged: number[] = [];
  const judge = async (index: number): Promise<Verdict> => {
    judged.push(index);
    if (unbuildable.has(index)) return 'skip';
    return index >= firstBad ? 'bad' : 'good';
  };
  return { judge, judged };
}

describe('bisect search (no git)', () => {
  it('finds every possible first bad commit of ranges up to 40 commits in at most ⌈log₂ n⌉ judgements', async () => {
    for (let n = 1; n <= 40; n++) {
      for (let firstBad = 1; firstBad <= n; firstBad++) {
        const { judge, judged } = oracle(firstBad);
        const outcome = await bisectSearch(n, judge);
        expect(outcome, `n ${n}, first bad ${firstBad}`).toMatchObject({ kind: 'found', firstBad });
        expect(judged.length).toBeLessThanOrEqual(maxJudgements(n));
        expect(new Set(judged).size).toBe(judged.length);
      }
    }
    expect(maxJudgements(15)).toBe(4);
  });

  it('tests the nearest buildable commit when the midpoint does not build', () => {
    expect(nextProbe(0, 15, new Set())).toBe(7);
    expect(nextProbe(0, 15, new Set([7]))).toBe(8);
    expect(nextProbe(0, 15, new Set([7, 8]))).toBe(6);
    expect(nextProbe(6, 8, new Set([7]))).toBeNull();
  });

  it('with unbuildable commits, names the first bad one or an ambiguous set that holds it — never a wrong commit', async () => {
    const random = new SeededRandom(21);
    for (let trial = 0; trial < 400; trial++) {
      const n = 2 + Math.floor(random.uniform() * 30);
      const firstBad = 1 + Math.floor(random.uniform() * n);
      const unbuildable = new Set<number>();
      for (let k = 1; k < n; k++) if (random.uniform() < 0.25) unbuildable.add(k);
      const { judge } = oracle(firstBad, unbuildable);
      const outcome = await bisectSearch(n, judge);
      if (outcome.kind === 'found') expect(outcome.firstBad).toBe(firstBad);
      else {
        expect(outcome.kind).toBe('ambiguous');
        if (outcome.kind === 'ambiguous') {
          expect(outcome.candidates).toContain(firstBad);
          // Every candidate but the last is a commit that did not build.
          for (const c of outcome.candidates.slice(0, -1)) expect(unbuildable.has(c)).toBe(true);
        }
      }
    }
  });

  it('with --verify-bad, reports a bad commit that judges good as not found', async () => {
    const { judge } = oracle(99);
    expect(await bisectSearch(15, judge, { verifyBad: true })).toMatchObject({ kind: 'notFound', reason: 'the bad commit judges good against the good commit' });
  });
});
