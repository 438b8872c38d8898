// --resume reuses a saved run only while the build's code is unchanged (builds/contentIdentity.ts):
// an edit to the module or to one of its local imports reruns that build's pairs, and says why.
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { runSuite } from '../../harness/commands/run.js';

const SCENARIO = 'test/run/fixtures/brief/brief-stand.yaml';

/** A module build holding each foot with a fixed stance force; its gain lives in a local import. */
function writeBuild(dir: string, share: number): string {
  writeFileSync(path.join(dir, 'gain.mjs'), `export const SHARE = ${share};\n`);
  const entry = path.join(dir, 'ctl.mjs');
  writeFileSync(
    entry,
    [
      "import { SHARE } from './gain.mjs';",
      'export function createController(setup) {',
      '  const n = setup.robot.hips_m.length;',
      '  const w = (setup.robot.trunk.mass_kg * Math.abs(setup.gravity_mps2[2])) / n;',
      '  return { telemetryNames: [], tick(obs, action) { for (let i = 0; i < n; i++) { action.mode[i] = 1; action.groundForce_N[3 * i + 2] = SHARE * w; } } };',
      '}',
      '',
    ].join('\n'),
  );
  return entry;
}

describe('resume keyed on the build\'s content', () => {
  it('reuses unchanged pairs, and reruns a build whose local import was edited', async () => {
    const dir = mkdtempSync(path.join(tmpdir(), 'footing-resume-'));
    const out = path.join(dir, 'out');
    const entry = writeBuild(dir, 1.0);
    const options = { paths: [SCENARIO], builds: [`mine=${entry}`, 'ref:governed'], outDir: out, jobs: 1, quiet: true };
    await runSuite(options);
    const same = await runSuite({ ...options, resume: true });
    expect(same.lines.join('\n')).toMatch(/resuming: 2 of 2 runs already complete/);
    writeBuild(dir, 0.9); // only gain.mjs changes
    const edited = await runSuite({ ...options, resume: true });
    const text = edited.lines.join('\n');
    expect(text).toMatch(/resuming: 1 of 2 runs already complete/);
    expect(text).toMatch(/rerunning the saved runs of build mine: its code changed/);
  }, 120_000);
});
