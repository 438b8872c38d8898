// Measures what the episode loop allocates per control tick and prints it as JSON: new-space
// growth and collections over a short and a long standing episode of the bundled dry walk (the
// bench's no-op build, harness/bench/targets.ts). The run's set-up (plant, scorer, histograms)
// allocates the same in both, so their difference over the extra ticks is the loop's own
// allocation. Growth is only a measure when no collection ran in either, so a pair with one is
// taken again (a few times: set-up alone can tip the young generation over). No forced
// collection: a full collection discards optimised code that holds the last run's objects, and the
// next run then starts in the interpreter, which boxes every double (measured: 6 kB per tick).
// Run by episodeAllocation.test.ts in a fresh process (test/support/allocationProbe.ts says why).

import { fileURLToPath } from 'node:url';
import { PerformanceObserver } from 'node:perf_hooks';
import v8 from 'node:v8';
import { standingBuild } from '../../../harness/bench/targets.js';
import { runEpisode } from '../../../harness/run/episode.js';
import { loadScenarioFile } from '../../../harness/scenario/index.js';

const newSpaceUsed = (): number => v8.getHeapSpaceStatistics().find((s) => s.space_name === 'new_space')?.space_used_size ?? 0;

const loaded = await loadScenarioFile(fileURLToPath(new URL('../../../scenarios/dry-baseline-walk.yaml', import.meta.url)));
if (!loaded.ok) throw new Error('cannot load the dry walk');
const base = loaded.scenarios[0];
const build = standingBuild(base);
const SHORT_s = 20;
const LONG_s = 80;

let collections = 0;
const observer = new PerformanceObserver((list) => {
  collections += list.getEntries().length;
});

async function growth(duration_s: number): Promise<{ bytes: number; ticks: number; collections: number }> {
  await new Promise((resolve) => setTimeout(resolve, 20));
  collections = 0;
  const before = newSpaceUsed();
  const outcome = await runEpisode({ ...base, duration_s }, build);
  const bytes = newSpaceUsed() - before;
  await new Promise((resolve) => setTimeout(resolve, 20));
  if (outcome.error || outcome.scored.metrics.fell) throw new Error(`the standing episode did not stand: ${outcome.error?.message ?? 'fell'}`);
  return { bytes, ticks: outcome.scored.metrics.ticks, collections };
}

observer.observe({ entryTypes: ['gc'] });
for (let k = 0; k < 8; k++) await runEpisode({ ...base, duration_s: 4 }, build); // warm-up: the JIT settles
let short = await growth(SHORT_s);
let long = await growth(LONG_s);
let attempts = 1;
while ((short.collections > 0 || long.collections > 0) && attempts < 5) {
  short = await growth(SHORT_s);
  long = await growth(LONG_s);
  attempts++;
}
observer.disconnect();
const extraTicks = long.ticks - short.ticks;
process.stdout.write(JSON.stringify({ collections: short.collections + long.collections, bytesPerCall: Math.max(0, long.bytes - short.bytes) / extraTicks, extraTicks, attempts }));
