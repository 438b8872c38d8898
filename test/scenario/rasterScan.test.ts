import { mkdtempSync, readFileSync, rmSync, truncateSync, writeFileSync, mkdirSync, copyFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import fc from 'fast-check';
import { afterAll, describe, expect, it } from 'vitest';
import { FILE_LIMITS } from '../../harness/files/bounded.js';
import { loadScenarioFile } from '../../harness/scenario/index.js';
import { MAX_RASTER_ERRORS, scanDecimal, scanRasterCsv } from '../../harness/scenario/rasterScan.js';
import { parseRasterCsv } from '../../harness/scenario/series.js';

const bytes = (text: string) => Buffer.from(text, 'utf8');
const both = (text: string) => ({ scanned: scanRasterCsv(bytes(text), 'maps/t.csv', '/ground/raster/file'), parsed: parseRasterCsv(text, 'maps/t.csv', '/ground/raster/file') });

describe('raster scanner: same values as the CSV reader', () => {
  it('reads the bundled checkerboard exactly as the CSV reader does', () => {
    const text = readFileSync(new URL('../../scenarios/maps/checkerboard-8x4.csv', import.meta.url), 'utf8');
    const { scanned, parsed } = both(text);
    expect(parsed.ok).toBe(true);
    expect(scanned).toEqual(parsed);
  });

  it('gives Number()’s value for every decimal form, fast path or not', () => {
    // Short decimals (one exact multiply/divide), long ones and far exponents (Number() on the text).
    const cases = ['0', '-0', '+1', '0.9', '.5', '5.', '0.1', '0.3', '1e3', '2.5E-3', '0.30000000000000004', '123456789012345678', '1e-30', '9.999999999999999e22', '1e400', '0000.0007', '4.35'];
    for (const text of cases) expect(Object.is(scanDecimal(bytes(text), 0, text.length), Number(text))).toBe(true);
    for (const text of ['', '.', '-', '1e', '1e+', '1.2.3', '0x10', '1,5', 'NaN', 'Infinity', '1 2']) expect(scanDecimal(bytes(text), 0, text.length)).toBeNaN();
  });

  it('matches on a generated raster with shuffled columns, comments, blank lines, spaces and CRLF', () => {
    // Deterministic invented values (a linear congruential sequence), written in several decimal forms.
    let state = 12345;
    const next = () => (state = (state * 1103515245 + 12345) % 2147483648) / 2147483648;
    const forms = [(x: number) => x.toFixed(3), (x: number) => String(x), (x: number) => x.toExponential(4), (x: number) => x.toPrecision(17)];
    const lines = ['# invented test raster', 'kineticFriction, j ,i,staticFriction', ''];
    const cells: string[] = [];
    for (let i = 0; i < 37; i++) {
      for (let j = 0; j < 23; j++) {
        const s = 0.1 + 1.5 * next();
        const k = s * next();
        const f = forms[(i + j) % forms.length];
        cells.push(`${f(k)}, ${j} ,${i},${f(s)}${(i * j) % 11 === 0 ? ' # note' : ''}`);
      }
    }
    // Rows in a shuffled order: the grid is indexed by (i, j), not by row order.
    for (let n = cells.length - 1; n > 0; n--) {
      const m = Math.floor(next() * (n + 1));
      [cells[n], cells[m]] = [cells[m], cells[n]];
    }
    const text = [...lines, ...cells].join('\r\n') + '\r\n';
    const { scanned, parsed } = both(text);
    expect(parsed.ok).toBe(true);
    expect(scanned).toEqual(parsed);
    if (!scanned.ok) return;
    expect(scanned.staticFriction.length).toBe(37);
    expect(scanned.staticFriction[0].length).toBe(23);
  });

  it('hands a file with quotes to the CSV reader', () => {
    const text = 'i,j,staticFriction,kineticFriction\n"0",0,0.9,"0.7"\n';
    const { scanned, parsed } = both(text);
    expect(scanned).toEqual(parsed);
    expect(scanned.ok).toBe(true);
  });
});

describe('raster scanner: random texts', () => {
  // Cells that exercise numbers, blanks, spaces, comments and stray commas; lines that are blank,
  // comments or a repeated header; LF or CRLF. Values, messages, their order and lines must agree.
  const cell = fc.oneof(
    fc.constantFrom('0', '1', '2', '0.9', '0.3', '.5', '5.', '1e0', '-0', '+1', 'x', '', ' 1', '1 ', '\t0.2', '1e400', '0.30000000000000004', '#c', '1,2'),
    fc.double({ min: 0, max: 3, noNaN: true }).map(String),
  );
  const line = fc.oneof(fc.array(cell, { minLength: 1, maxLength: 5 }).map((c) => c.join(',')), fc.constantFrom('', '   ', '# note', 'i,j,staticFriction,kineticFriction'));
  it('agree with the CSV reader', () => {
    fc.assert(
      fc.property(fc.array(line, { maxLength: 12 }), fc.constantFrom('\n', '\r\n'), fc.boolean(), (lines, eol, header) => {
        const text = (header ? ['i,j,staticFriction,kineticFriction', ...lines] : lines).join(eol);
        const { scanned, parsed } = both(text);
        expect(scanned).toEqual(parsed);
      }),
      { numRuns: 500, seed: 20261202 },
    );
  });
});

describe('raster scanner: bad input named with file and line', () => {
  const shown = (text: string) => {
    const r = scanRasterCsv(bytes(text), 'maps/t.csv', '/ground/raster/file');
    return r.ok ? [] : r.errors.map((e) => `${e.file}:${e.line} ${e.path}: ${e.message}`);
  };
  const header = 'i,j,staticFriction,kineticFriction\n';

  it('gives the CSV reader’s messages and lines for bad rows', () => {
    const cases = [
      header + '0,0,0.9,0.7\n0,1,0.3,0.5\n1,1,0.9,0.7\n',
      header + '0,0,abc,0.7\n\n# c\n0,1,0.3\n',
      header + '0,0,0.9,0.7\n0,0,0.8,0.6\n',
      header + '0,0,0.9,0.7\n1.5,0,0.9,0.7\n-1,0,1,1\n1000,0,1,1\n0,1,11,0.5\n',
      header + '0,0,0.9,0.7\n1,1,0.9,0.7\n',
      'i,j,staticFriction,kineticFrictoin\n0,0,1,1\n',
      'i,j,i,staticFriction,kineticFriction\n',
      header,
      '# only a comment\n',
      '',
    ];
    for (const text of cases) {
      const { scanned, parsed } = both(text);
      expect(scanned.ok).toBe(false);
      expect(scanned).toEqual(parsed);
    }
  });

  it('names the file and line of the bad row', () => {
    expect(shown(header + '0,0,0.9,0.7\r\n\r\n0,1,0.3,x1\n')).toEqual(['maps/t.csv:4 /ground/raster/file: kineticFriction "x1" is not a finite number']);
    expect(shown(header + '0,0,0.9,0.7\n1,1,0.9,0.7\n')).toEqual([
      'maps/t.csv:1 /ground/raster/file: the 2×2 grid lacks cells (0, 1), (1, 0) (expected every cell exactly once)',
    ]);
  });

  it('keeps at most MAX_RASTER_ERRORS messages for a wholly wrong file', () => {
    const rows = Array.from({ length: 400 }, (_, n) => `${n},0,x,0`).join('\n');
    expect(shown(header + rows)).toHaveLength(MAX_RASTER_ERRORS);
  });
});

describe('raster file size limit', () => {
  const dir = mkdtempSync(path.join(tmpdir(), 'footing-raster-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it('refuses a raster file over the limit before reading it', async () => {
    const suite = path.join(dir, 'scenarios');
    mkdirSync(path.join(suite, 'maps'), { recursive: true });
    for (const name of ['checkerboard-tiles.yaml']) copyFileSync(new URL(`../../scenarios/${name}`, import.meta.url), path.join(suite, name));
    const robot = readFileSync(new URL('../../scenarios/checkerboard-tiles.yaml', import.meta.url), 'utf8').match(/^robot:\s*(\S+)/m)?.[1];
    if (robot) {
      mkdirSync(path.dirname(path.join(suite, robot)), { recursive: true });
      copyFileSync(new URL(`../../scenarios/${robot}`, import.meta.url), path.join(suite, robot));
    }
    const csv = path.join(suite, 'maps', 'checkerboard-8x4.csv');
    writeFileSync(csv, '');
    // A sparse file one byte over the limit: if it were read, the test would take seconds and the
    // scanner would report bad rows of NUL bytes instead of the size.
    truncateSync(csv, FILE_LIMITS.rasterFile_bytes + 1);
    const r = await loadScenarioFile(path.join(suite, 'checkerboard-tiles.yaml'), { cwd: dir });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.errors.map((e) => `${e.path}: ${e.message}`)).toEqual([
      `/ground/raster/file: raster file "maps/checkerboard-8x4.csv" cannot be read (the file is ${FILE_LIMITS.rasterFile_bytes + 1} bytes, more than the 64 MiB allowed (limit ${FILE_LIMITS.rasterFile_bytes} bytes); nothing was parsed; resolved to scenarios/maps/checkerboard-8x4.csv)`,
    ]);
  });
});
