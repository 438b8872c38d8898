import { readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { readSeriesFor, seriesPath } from '../../harness/score/series/file.js';
import { smallRun } from './support.js';

describe('series files the run itself wrote', () => {
  it('skips only their content check; any other file is still checked', async () => {
    const { dir, results } = await smallRun();
    const run = results.runs.find((r) => r.build === 'governed')!;
    const file = path.join(dir, seriesPath(run.scenario.id, run.build));
    const good = readSeriesFor([dir], run.scenario.id, run.scenario.hash, run.build);
    expect(good.series).not.toBeNull();
    // A series whose time axis is not a list: the content check refuses it.
    const broken = { ...JSON.parse(readFileSync(file, 'utf8')), t_s: 'not a list' };
    writeFileSync(file, JSON.stringify(broken));
    const checked = readSeriesFor([dir], run.scenario.id, run.scenario.hash, run.build);
    expect(checked.series).toBeNull();
    if (checked.series === null) expect(checked.problem).toMatch(/series unusable/);
    expect(readSeriesFor([dir], run.scenario.id, run.scenario.hash, run.build, new Set([path.join(dir, 'series', 'other.json')])).series).toBeNull();
    // Named as written by this process: read as it is (the recorder made it, so no check).
    expect(readSeriesFor([dir], run.scenario.id, run.scenario.hash, run.build, new Set([file])).series).not.toBeNull();
    // The scenario hash is still compared.
    expect(readSeriesFor([dir], run.scenario.id, 'another-hash', run.build, new Set([file])).series).toBeNull();
  });
});
