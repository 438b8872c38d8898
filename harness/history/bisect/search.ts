// The bisection itself, apart from git and builds: commits 0…n of a first-parent range, 0 the good
// commit (already judged), n the bad one (taken as bad, as `git bisect` takes the commit you call
// bad; `--verify-bad` runs it first). The first bad commit lies in (lo, hi]; each judged midpoint
// halves that interval, so ⌈log₂ n⌉ judgements find it. A commit that cannot be built is a skip:
// the nearest untested commit to the midpoint is tried instead, and when only skipped commits are
// left between lo and hi the answer is ambiguous among them and hi.

export type Verdict = 'good' | 'bad' | 'skip';

export interface SearchStep {
  index: number;
  verdict: Verdict;
}

export type SearchOutcome =
  | { kind: 'found'; firstBad: number; steps: SearchStep[] }
  | { kind: 'ambiguous'; candidates: number[]; steps: SearchStep[] }
  | { kind: 'notFound'; reason: string; steps: SearchStep[] };

/** Judgements a search of n commits needs at most when nothing is skipped. */
export function maxJudgements(n: number): number {
  return n <= 1 ? 0 : Math.ceil(Math.log2(n));
}

/** The untested commit in (lo, hi) nearest to the midpoint (the later one first on a tie); null when none is left. */
export function nextProbe(lo: number, hi: number, skipped: ReadonlySet<number>): number | null {
  const mid = Math.floor((lo + hi) / 2);
  for (let d = 0; d < hi - lo; d++) {
    for (const k of d === 0 ? [mid] : [mid + d, mid - d]) {
      if (k > lo && k < hi && !skipped.has(k)) return k;
    }
  }
  return null;
}

export async function bisectSearch(n: number, judge: (index: number) => Promise<Verdict>, options: { verifyBad?: boolean } = {}): Promise<SearchOutcome> {
  const steps: SearchStep[] = [];
  const skipped = new Set<number>();
  if (n < 1) return { kind: 'notFound', reason: 'the bad commit is the good commit: nothing to search', steps };
  if (options.verifyBad) {
    const verdict = await judge(n);
    steps.push({ index: n, verdict });
    if (verdict === 'good') return { kind: 'notFound', reason: 'the bad commit judges good against the good commit', steps };
    if (verdict === 'skip') return { kind: 'notFound', reason: 'the bad commit cannot be built, so it cannot be confirmed bad', steps };
  }
  let lo = 0;
  let hi = n;
  for (;;) {
    const probe = nextProbe(lo, hi, skipped);
    if (probe === null) break;
    const verdict = await judge(probe);
    steps.push({ index: probe, verdict });
    if (verdict === 'good') lo = probe;
    else if (verdict === 'bad') hi = probe;
    else skipped.add(probe);
  }
  const between = [...skipped].filter((k) => k > lo && k < hi).sort((a, b) => a - b);
  if (between.length > 0) return { kind: 'ambiguous', candidates: [...between, hi], steps };
  return { kind: 'found', firstBad: hi, steps };
}
