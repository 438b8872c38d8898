// The import and replay verbs through the command line: exit codes as documented (0 done, 1 not
// reproduced, 2 bad input with nothing written).

import { existsSync, readdirSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it, vi } from 'vitest';
import { main } from '../../harness/cli/main.js';
import { DEMO_CSV, DEMO_MAP, tempDir, writeMap } from './support.js';

describe('footing import / replay on the command line', () => {
  it('imports the demo log, then replays it (exit 0)', async () => {
    const out = path.join(tempDir('cli'), 'scenario');
    const write = vi.spyOn(process.stdout, 'write').mockImplementation(() => true);
    try {
      expect(await main(['import', DEMO_CSV, '--map', DEMO_MAP, '--out', out])).toBe(0);
      expect(await main(['replay', path.join(out, 'demo-wet-hall.yaml'), '--build', 'ref:overtrusting', '--out', path.join(out, 'replay')])).toBe(0);
    } finally {
      write.mockRestore();
    }
    expect(existsSync(path.join(out, 'replay', 'results.json'))).toBe(true);
  });

  it('exits 2 on a bad map and writes nothing', async () => {
    const dir = tempDir('cli-bad');
    const out = path.join(dir, 'out');
    const map = writeMap(dir, [['format: footing-log-map', 'format: footing-log-mop']]);
    const errors: string[] = [];
    const write = vi.spyOn(process.stderr, 'write').mockImplementation((chunk) => (errors.push(String(chunk)), true));
    try {
      expect(await main(['import', DEMO_CSV, '--map', map, '--out', out])).toBe(2);
    } finally {
      write.mockRestore();
    }
    expect(errors.join('')).toMatch(/map\.yaml:\d+:\d+ \/format: format "footing-log-mop" is not a log map \(expected format: footing-log-map\)/);
    expect(existsSync(out) ? readdirSync(out) : []).toEqual([]);
  });

  it('exits 2 when replay is given a scenario that was not imported', async () => {
    const errors: string[] = [];
    const write = vi.spyOn(process.stderr, 'write').mockImplementation((chunk) => (errors.push(String(chunk)), true));
    try {
      expect(await main(['replay', 'scenarios/slick-patch-abrupt.yaml', '--build', 'ref:governed', '--out', tempDir('cli-replay')])).toBe(2);
    } finally {
      write.mockRestore();
    }
    expect(errors.join('')).toMatch(/no recorded block \(replay needs a scenario made by footing import\)/);
  });
});
