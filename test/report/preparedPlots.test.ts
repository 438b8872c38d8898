// The plots drawn ahead of the gate (prepareScenarioPlots, used by `footing run` while the gate's
// loop time is timed in another thread) must give the very page drawn in one pass, and plots
// prepared for something else must be drawn again, never shown.
import { describe, expect, it } from 'vitest';
import { gateWithinResults } from '../../harness/gate/gate.js';
import { defaultPolicy } from '../../harness/gate/defaults.js';
import { renderReportHtml } from '../../harness/report/index.js';
import { prepareScenarioPlots } from '../../harness/report/model.js';
import { smallRun } from './support.js';

describe('scenario plots prepared ahead of the gate', () => {
  it('give the same report as plots drawn with it; plots for another baseline are drawn again', async () => {
    const { dir, results } = await smallRun();
    const gate = gateWithinResults(results, 'nominal', defaultPolicy());
    const generatedAt = new Date('2026-01-01T00:00:00Z');
    const direct = renderReportHtml(results, { outDir: dir, baseline: 'nominal', gate, generatedAt });
    const prepared = prepareScenarioPlots(results, { outDir: dir, baseline: 'nominal' });
    expect(prepared.scenarios.size).toBeGreaterThan(0);
    expect(renderReportHtml(results, { outDir: dir, baseline: 'nominal', gate, generatedAt, preparedPlots: prepared })).toBe(direct);

    // Prepared with governed as the baseline: its styles and lanes differ, so the report must not use them.
    const other = prepareScenarioPlots(results, { outDir: dir, baseline: 'governed' });
    expect(other.signature).not.toBe(prepared.signature);
    expect(renderReportHtml(results, { outDir: dir, baseline: 'nominal', gate, generatedAt, preparedPlots: other })).toBe(direct);
    // Prepared for fewer runs (another results set): drawn again too.
    const fewer = prepareScenarioPlots({ ...results, runs: results.runs.slice(1) }, { outDir: dir, baseline: 'nominal' });
    expect(renderReportHtml(results, { outDir: dir, baseline: 'nominal', gate, generatedAt, preparedPlots: fewer })).toBe(direct);
  });
});
