// Series files: series/<scenario-id>__<build>.json below a results folder, one per run, written
// atomically by the worker that ran it. Read back leniently: a missing or foreign file only means
// the report shows "no series" for that run, never a failed report.

import { existsSync } from 'node:fs';
import { readBoundedTextSync } from '../../files/bounded.js';
import { validateSeries } from './validate.js';
import path from 'node:path';
import { writeFileAtomicSync } from '../../files/atomic.js';
import { SERIES_FORMAT, SERIES_FORMAT_VERSION, type RunSeries } from './types.js';

export const SERIES_FOLDER = 'series';

/** Relative path of a run's series file; the same file-safe naming as trace CSVs. */
export function seriesPath(scenarioId: string, build: string): string {
  const safe = (name: string) => name.replace(/[^A-Za-z0-9._-]/g, '_');
  return `${SERIES_FOLDER}/${safe(scenarioId)}__${safe(build)}.json`;
}

export function writeSeriesFile(resultsDir: string, series: RunSeries): string {
  const relative = seriesPath(series.scenario.id, series.build);
  writeFileAtomicSync(path.join(resultsDir, relative), JSON.stringify(series), { durable: false });
  return relative;
}

export type SeriesLookup = { series: RunSeries; file: string } | { series: null; problem: string };

/**
 * Finds the series of a run in the first folder holding one that matches its scenario hash.
 * `written` names series files (absolute paths) this process's own runs wrote moments ago: their
 * content check is skipped (they came from the recorder, not from a person), the format, scenario
 * hash and build are still compared.
 */
export function readSeriesFor(roots: string[], scenarioId: string, hash: string, build: string, written?: ReadonlySet<string>): SeriesLookup {
  const relative = seriesPath(scenarioId, build);
  let problem = `no ${relative} in ${roots.join(', ') || '(no folder)'}`;
  for (const root of roots) {
    const file = path.join(root, relative);
    if (!existsSync(file)) continue;
    try {
      const value = JSON.parse(readBoundedTextSync(file)) as Partial<RunSeries>;
      if (value?.format !== SERIES_FORMAT || value.formatVersion !== SERIES_FORMAT_VERSION) {
        problem = `${file}: not a ${SERIES_FORMAT} v${SERIES_FORMAT_VERSION} file`;
        continue;
      }
      const checked = written?.has(file) ? ({ ok: true } as const) : validateSeries(value);
      if (!checked.ok) {
        problem = `${file}: series unusable (${checked.problem})`;
        continue;
      }
      if (value.scenario?.hash !== hash || value.build !== build) {
        problem = `${file}: recorded for another version of the scenario or another build`;
        continue;
      }
      return { series: value as RunSeries, file };
    } catch (error) {
      problem = `${file}: unreadable (${(error as Error).message})`;
    }
  }
  return { series: null, problem };
}
