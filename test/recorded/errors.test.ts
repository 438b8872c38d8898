// Bad input to footing import is refused with exit 2, a message naming the file, line or field, the
// value and what was expected — and nothing is written.

import { existsSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { importLog } from '../../harness/recorded/importLog.js';
import { unitInName } from '../../harness/recorded/units.js';
import { DEMO_CSV, DEMO_MCAP, tempDir, writeCsv, writeMap } from './support.js';

async function refused(log: string, map: string) {
  const dir = tempDir('refused');
  const out = path.join(dir, 'out');
  const outcome = await importLog({ log, map, out });
  expect(outcome.exitCode, outcome.lines.join('\n')).toBe(2);
  expect(outcome.lines[outcome.lines.length - 1]).toBe('footing import: nothing was written');
  expect(existsSync(out) ? readdirSync(out) : []).toEqual([]);
  return outcome.lines.join('\n');
}

describe('footing import refuses bad input', () => {
  it('a map with an unknown field, naming its line and the field', async () => {
    const dir = tempDir('map');
    const map = writeMap(dir, [['  offset_s: 0.004', '  offset_s: 0.004\n  ofset: 1']]);
    const text = await refused(DEMO_CSV, map);
    expect(text).toMatch(/map\.yaml:\d+:\d+ \/time\/ofset: unknown field "ofset"/);
  });

  it('a map whose feet do not match the robot', async () => {
    const dir = tempDir('map');
    const map = writeMap(dir, [['feet: [FL, FR, HL, HR]', 'feet: [FL, FR, HL]']]);
    const text = await refused(DEMO_CSV, map);
    expect(text).toMatch(/\/foot\/HR: foot "HR" is not in feet/);
  });

  it('a log missing a mapped column, naming the header line and the map line', async () => {
    const dir = tempDir('csv');
    const log = writeCsv(dir, (lines) => lines.map((l) => (l.startsWith('stamp_s') ? l.replace('HL_fz_N', 'HL_fz') : l)));
    const text = await refused(log, writeMap(dir));
    expect(text).toMatch(/log\.csv:3: missing column "HL_fz_N" mapped at .*map\.yaml:\d+:\d+ \/foot\/HL\/force\/csv\/2 \(did you mean "[A-Z]{2}_fz_?N?"\?\)/);
  });

  it('an MCAP log missing a mapped topic, listing the topics it has', async () => {
    const dir = tempDir('mcap');
    const map = writeMap(dir, [['topic: /estimator/external_force', 'topic: /estimator/wrench']]);
    const text = await refused(DEMO_MCAP, map);
    expect(text).toMatch(/missing topic \/estimator\/wrench mapped at .*\/externalForce\/mcap\/topic \(the log has \/estimator\/base, \/estimator\/external_force, \/estimator\/feet, \/operator\/command\)/);
  });

  it('non-monotonic time, naming both lines and values', async () => {
    const dir = tempDir('csv');
    // Lines 10 and 11 of the file (samples 7 and 8) swapped.
    const log = writeCsv(dir, (lines) => lines.map((l, i) => (i === 9 ? lines[10] : i === 10 ? lines[9] : l)));
    const text = await refused(log, writeMap(dir));
    expect(text).toMatch(/log\.csv:11: time 0\.028 s does not increase \(line 10 has 0\.032; expected strictly increasing sample times\)/);
  });

  it('a unit the column name contradicts', async () => {
    const dir = tempDir('units');
    const map = writeMap(dir, [[/csv: \[base_px_m, base_py_m, base_pz_m\]\n(.*)\n    unit: m/, 'csv: [base_px_m, base_py_m, base_pz_m]\n$1\n    unit: mm']]);
    const text = await refused(DEMO_CSV, map);
    expect(text).toMatch(/unit mismatch: "base_px_m" is named in m, but the map says unit: mm/);
  });

  it('a unit the values contradict (trunk height read in mm from a log in m)', async () => {
    const dir = tempDir('units');
    const log = writeCsv(dir, (lines) => lines.map((l) => (l.startsWith('stamp_s') ? l.replace(/base_p([xyz])_m/g, 'base_p$1') : l)));
    const map = writeMap(dir, [[/csv: \[base_px_m, base_py_m, base_pz_m\]\n(.*)\n    unit: m/, 'csv: [base_px, base_py, base_pz]\n$1\n    unit: mm']]);
    const text = await refused(log, map);
    expect(text).toMatch(/unit mismatch: the mean trunk height reads 0\.000\d+ m with unit: mm, but robot quad-24kg stands at 0\.3 m/);
  });

  it('a quaternion that is not one (angles mapped as a quaternion)', async () => {
    const dir = tempDir('units');
    const log = writeCsv(dir, (lines) => lines.map((l, i) => (i === 3 ? l.replace(/^([^,]*,[^,]*,[^,]*,[^,]*),0,0,0,1,/, '$1,0,0,90,1,') : l)));
    const text = await refused(log, writeMap(dir));
    expect(text).toMatch(/log\.csv:4: unit mismatch: trunk orientation .* has norm 90\.006 \(expected a unit quaternion/);
  });

  it('a log longer than a scenario may last', async () => {
    const dir = tempDir('long');
    // Header, then two samples 3601 s apart (the scenario limit is 3600 s).
    const log = writeCsv(dir, (lines) => [...lines.slice(0, 4), lines[4].replace(/^[^,]*/, '3601.004')]);
    expect(await refused(log, writeMap(dir))).toMatch(/the log runs to 3601\.004 s of scenario time .*expected ≤ 3600 s/);
  });

  it('a log of unknown format', async () => {
    const dir = tempDir('format');
    const log = path.join(dir, 'log.txt');
    writeFileSync(log, readFileSync(DEMO_CSV));
    expect(await refused(log, writeMap(dir))).toMatch(/unknown log format "\.txt" \(expected \.csv or \.mcap\)/);
  });
});

describe('units spelled in names', () => {
  it('reads trailing _unit, [unit] and (unit)', () => {
    expect(unitInName('base_px_m')).toEqual({ unit: 'm', dimension: 'length' });
    expect(unitInName('roll[deg]')).toEqual({ unit: 'deg', dimension: 'angle' });
    expect(unitInName('speed (m/s)')).toEqual({ unit: 'mps', dimension: 'velocity' });
    expect(unitInName('FL_contact')).toBeUndefined();
  });
});
