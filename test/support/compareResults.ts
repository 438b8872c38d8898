// Compares two results folders of `footing run` metric by metric, leaving out what depends on the
// machine or the moment: wall times, real-time factor, loop time (measured on the host), start
// time, machine and the builds' git state. Used to show that a refactor left every result as it
// was (every metric of every run, and every report series file).
//
//   npx tsx test/support/compareResults.ts BEFORE_DIR AFTER_DIR   → exit 0 identical, 1 differences

import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

/** Keys whose values are measured on the host, not computed by the simulation. */
const HOST_KEYS = new Set(['startedAt', 'wall_s', 'realTimeFactor', 'loopTime_us', 'loopTime', 'machine', 'git', 'commit', 'dirty']);

export function differences(before: unknown, after: unknown, at = ''): string[] {
  if (typeof before !== 'object' || before === null || typeof after !== 'object' || after === null) {
    return Object.is(before, after) ? [] : [`${at || '/'}: ${JSON.stringify(before)} → ${JSON.stringify(after)}`];
  }
  if (Array.isArray(before) !== Array.isArray(after)) return [`${at || '/'}: list vs mapping`];
  const keys = new Set([...Object.keys(before), ...Object.keys(after)]);
  const out: string[] = [];
  for (const key of keys) {
    if (HOST_KEYS.has(key)) continue;
    out.push(...differences((before as Record<string, unknown>)[key], (after as Record<string, unknown>)[key], `${at}/${key}`));
  }
  return out;
}

/** Reasons that quote a measured loop time are host facts too (the loop budget sentence). */
function withoutHostReasons(results: { runs: { reasons: string[] }[] }): unknown {
  return { ...results, runs: results.runs.map((run) => ({ ...run, reasons: run.reasons.filter((r) => !/loop time/i.test(r)) })) };
}

export function compareResultFolders(beforeDir: string, afterDir: string): string[] {
  const read = (dir: string, file: string) => JSON.parse(readFileSync(path.join(dir, file), 'utf8'));
  const found = differences(withoutHostReasons(read(beforeDir, 'results.json')), withoutHostReasons(read(afterDir, 'results.json')), 'results.json');
  const series = (dir: string) => readdirSync(path.join(dir, 'series')).filter((f) => f.endsWith('.json')).sort();
  const names = new Set([...series(beforeDir), ...series(afterDir)]);
  for (const name of names) {
    const file = path.join('series', name);
    try {
      found.push(...differences(read(beforeDir, file), read(afterDir, file), file));
    } catch (error) {
      found.push(`${file}: ${(error as Error).message}`);
    }
  }
  return found;
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const [beforeDir, afterDir] = process.argv.slice(2);
  const found = compareResultFolders(beforeDir, afterDir);
  for (const line of found.slice(0, 50)) console.log(line);
  const runs = (JSON.parse(readFileSync(path.join(afterDir, 'results.json'), 'utf8')) as { runs: unknown[] }).runs.length;
  console.log(found.length === 0 ? `identical: ${runs} runs and their series files` : `${found.length} differences`);
  process.exitCode = found.length === 0 ? 0 : 1;
}
