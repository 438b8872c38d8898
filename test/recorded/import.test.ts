// Importing the invented demo log: the CSV and the MCAP copy give one scenario (same hash), the
// written scenario loads like any other, and replaying it with the build and plant settings that
// made the log reproduces the recording within the stated tolerances.

import { existsSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { importLog } from '../../harness/recorded/importLog.js';
import { replayRecording } from '../../harness/recorded/replay.js';
import { FIDELITY_TOLERANCES } from '../../harness/score/fidelity.js';
import { loadScenarioFile } from '../../harness/scenario/index.js';
import { DEMO_CSV, DEMO_MAP, DEMO_MCAP, tempDir } from './support.js';

describe('footing import of the demo log', () => {
  let csvOut: string;
  let mcapOut: string;
  let csv: Awaited<ReturnType<typeof importLog>>;
  let mcap: Awaited<ReturnType<typeof importLog>>;

  beforeAll(async () => {
    csvOut = tempDir('import-csv');
    mcapOut = tempDir('import-mcap');
    csv = await importLog({ log: DEMO_CSV, map: DEMO_MAP, out: csvOut });
    mcap = await importLog({ log: DEMO_MCAP, map: DEMO_MAP, out: mcapOut });
  });

  it('imports both formats with exit 0', () => {
    expect(csv.exitCode, csv.lines.join('\n')).toBe(0);
    expect(mcap.exitCode, mcap.lines.join('\n')).toBe(0);
  });

  it('gives the same scenario hash from CSV and from MCAP', () => {
    expect(csv.hash).toMatch(/^[0-9a-f]{64}$/);
    expect(mcap.hash).toBe(csv.hash);
    // The recorded trajectories are byte-identical too (the hash covers their sha256).
    expect(readFileSync(path.join(mcapOut, 'demo-wet-hall.trajectory.csv'), 'utf8')).toBe(readFileSync(path.join(csvOut, 'demo-wet-hall.trajectory.csv'), 'utf8'));
  });

  it('writes a scenario the loader accepts, naming its recorded trajectory and its sha256', async () => {
    const loaded = await loadScenarioFile(path.join(csvOut, 'demo-wet-hall.yaml'));
    expect(loaded.ok).toBe(true);
    if (!loaded.ok) return;
    const s = loaded.scenarios[0];
    expect(s.hash).toBe(csv.hash);
    expect(s.recorded?.trajectory).toBe('demo-wet-hall.trajectory.csv');
    // The logged commands were stand, trot 0.5 m/s at 1 s, stand at 8 s (demo-truth.yaml).
    expect(s.commands.map((c) => [c.at_s, c.gait, c.velocity_mps[0]])).toEqual([[0, 'stand', 0], [1, 'trot', 0.5], [8, 'stand', 0]]);
    // The push came from the logged external-force estimate: 70 N sideways (demo-truth.yaml), noise σ 2 N.
    const push = s.plant.pushes[0];
    expect(push.kind).toBe('series');
    if (push.kind === 'series') {
      const peak = Math.max(...push.force_N.map((f) => f[1]));
      expect(peak).toBeGreaterThan(70 - 5 * 2);
      expect(peak).toBeLessThan(70 + 5 * 2);
      expect(push.t_s[0]).toBeGreaterThan(5.4);
      expect(push.t_s[push.t_s.length - 1]).toBeLessThan(5.9);
    }
  });

  it('refuses a scenario whose recorded trajectory was edited after the import', async () => {
    const { writeFileSync } = await import('node:fs');
    const file = path.join(mcapOut, 'demo-wet-hall.trajectory.csv');
    writeFileSync(file, readFileSync(file, 'utf8').replace(/\n0\.004000,/, '\n0.004001,'));
    const loaded = await loadScenarioFile(path.join(mcapOut, 'demo-wet-hall.yaml'));
    expect(loaded.ok).toBe(false);
    if (!loaded.ok) expect(loaded.errors[0].message).toMatch(/has sha256 [0-9a-f]{64}, not the [0-9a-f]{64} this scenario was imported with/);
  });

  it('replays with the build that made the log and reproduces it within the tolerances', async () => {
    const out = tempDir('replay');
    const replay = await replayRecording({ scenario: path.join(csvOut, 'demo-wet-hall.yaml'), build: 'ref:overtrusting', out });
    expect(replay.exitCode, replay.lines.join('\n')).toBe(0);
    const f = replay.fidelity!;
    expect(f.firstExceeded).toBeNull();
    expect(f.trunkPositionError_m.max).toBeLessThan(FIDELITY_TOLERANCES.trunkPosition_m);
    expect(f.slips.recorded).toBeGreaterThan(0);
    // Most recorded slips are reproduced; the simulator invents none (measured 13 of 16, 0 extra).
    expect(f.slips.reproduced / f.slips.recorded).toBeGreaterThan(0.5);
    expect(f.note).toMatch(/not a verdict on the controller/);
    expect(existsSync(path.join(out, 'fidelity.json'))).toBe(true);
    // results.json carries the fidelity block (validated against results.schema.json when written)
    // and the report shows recorded vs simulated overlays with the page's caveat.
    const results = JSON.parse(readFileSync(path.join(out, 'results.json'), 'utf8'));
    expect(results.runs[0].fidelity.slips.recorded).toBe(f.slips.recorded);
    const html = readFileSync(path.join(out, 'report.html'), 'utf8');
    expect(html).toContain('class="plot recorded-path"');
    expect(html).toContain('class="plot recorded-error"');
    expect(html).toContain('not a verdict on the controller');
  });
});
