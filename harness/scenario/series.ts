// CSV data referenced by scenarios: recorded push series (t_s,fx_N,fy_N,fz_N) and friction
// rasters (i,j,staticFriction,kineticFriction, one row per cell). Errors name the CSV file's line.

import { parse } from 'csv-parse/sync';
import type { Vec3 } from '../plant/types.js';
import type { Finding } from '../files/issue.js';
import { hintFor } from '../files/suggest.js';

/** Bounds that keep a mistaken file from eating the machine; far above any real recording. */
export const MAX_SERIES_ROWS = 1_000_000;
export const MAX_RASTER_CELLS_PER_AXIS = 1000;

const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

interface Row {
  cells: string[];
  line: number;
}

type Table = { ok: true; header: Row; rows: Row[] } | { ok: false; errors: Finding[] };

function readTable(text: string, file: string, pointer: string, columns: readonly string[]): Table {
  let records: { record: string[]; info: { lines: number } }[];
  try {
    records = parse(text, { info: true, skip_empty_lines: true, trim: true, comment: '#', relax_column_count: true }) as unknown as typeof records;
  } catch (e) {
    const err = e as Error & { lines?: number };
    return { ok: false, errors: [{ path: pointer, file, line: err.lines, column: 1, message: `CSV: ${err.message.split('\n')[0]}` }] };
  }
  if (records.length === 0) {
    return { ok: false, errors: [{ path: pointer, file, line: 1, column: 1, message: `the CSV file is empty (expected a header ${columns.join(',')} and data rows)` }] };
  }
  const header: Row = { cells: records[0].record, line: records[0].info.lines };
  const errors: Finding[] = [];
  const at = (line: number, message: string, hint?: string): Finding => ({ path: pointer, file, line, column: 1, message, hint });
  for (const name of header.cells) {
    if (!columns.includes(name)) errors.push(at(header.line, `unknown column "${name}" in the header (expected ${columns.join(',')})`, hintFor(name, columns)));
  }
  for (const name of columns) {
    if (!header.cells.includes(name)) errors.push(at(header.line, `missing column "${name}" in the header (expected ${columns.join(',')})`));
  }
  const duplicated = header.cells.filter((c, i) => header.cells.indexOf(c) !== i);
  if (duplicated.length) errors.push(at(header.line, `column ${duplicated.map((d) => `"${d}"`).join(', ')} appears twice in the header`));
  if (errors.length) return { ok: false, errors };
  if (records.length - 1 > MAX_SERIES_ROWS) return { ok: false, errors: [at(header.line, `${records.length - 1} rows, more than the ${MAX_SERIES_ROWS} allowed`)] };
  return { ok: true, header, rows: records.slice(1).map((r) => ({ cells: r.record, line: r.info.lines })) };
}

/** Reads the named numeric columns of each row; reports every bad cell. */
function numericRows(table: Extract<Table, { ok: true }>, file: string, pointer: string, columns: readonly string[], errors: Finding[]) {
  const index = columns.map((c) => table.header.cells.indexOf(c));
  const out: { values: number[]; line: number }[] = [];
  for (const row of table.rows) {
    if (row.cells.length !== table.header.cells.length) {
      errors.push({ path: pointer, file, line: row.line, column: 1, message: `row has ${row.cells.length} cells, the header has ${table.header.cells.length}` });
      continue;
    }
    const values: number[] = [];
    let good = true;
    index.forEach((col, k) => {
      const text = row.cells[col];
      const value = NUMBER.test(text) ? Number(text) : Number.NaN;
      if (!Number.isFinite(value)) {
        errors.push({ path: pointer, file, line: row.line, column: 1, message: `${columns[k]} ${JSON.stringify(text)} is not a finite number` });
        good = false;
      }
      values.push(value);
    });
    if (good) out.push({ values, line: row.line });
  }
  return out;
}

export const SERIES_COLUMNS = ['t_s', 'fx_N', 'fy_N', 'fz_N'] as const;

export type SeriesOutcome = { ok: true; t_s: number[]; force_N: Vec3[] } | { ok: false; errors: Finding[] };

/**
 * A recorded push. Times are shifted by `offset_s` and must be strictly increasing, start at or
 * after 0 and end by the scenario's duration (the plant applies zero force outside the samples).
 */
export function parseSeriesCsv(text: string, file: string, pointer: string, offset_s: number, duration_s: number | undefined): SeriesOutcome {
  const table = readTable(text, file, pointer, SERIES_COLUMNS);
  if (!table.ok) return table;
  const errors: Finding[] = [];
  const rows = numericRows(table, file, pointer, SERIES_COLUMNS, errors);
  const t_s: number[] = [];
  const force_N: Vec3[] = [];
  let previous: { t: number; raw: number; line: number } | undefined;
  for (const { values, line } of rows) {
    const t = values[0] + offset_s;
    if (previous && !(t > previous.t)) {
      errors.push({ path: pointer, file, line, column: 1, message: `t_s ${values[0]} is not after ${previous.raw} on line ${previous.line} (expected strictly increasing t_s)` });
    }
    if (t < 0) errors.push({ path: pointer, file, line, column: 1, message: `t_s ${values[0]} is before the start of the run (expected t_s ≥ 0)` });
    if (duration_s !== undefined && t > duration_s) {
      errors.push({ path: pointer, file, line, column: 1, message: `sample at ${t} s is after the end of the scenario (duration_s ${duration_s}; expected every sample inside the run)` });
    }
    previous = { t, raw: values[0], line };
    t_s.push(t);
    force_N.push([values[1], values[2], values[3]]);
  }
  if (errors.length === 0 && t_s.length < 2) {
    errors.push({ path: pointer, file, line: table.header.line, column: 1, message: `the series has ${t_s.length} sample${t_s.length === 1 ? '' : 's'} (expected at least 2)` });
  }
  return errors.length ? { ok: false, errors } : { ok: true, t_s, force_N };
}

export const RASTER_COLUMNS = ['i', 'j', 'staticFriction', 'kineticFriction'] as const;

export type RasterOutcome = { ok: true; staticFriction: number[][]; kineticFriction: number[][] } | { ok: false; errors: Finding[] };

/** One row per cell (i = x index, j = y index, from 0); every cell of the grid exactly once. */
export function parseRasterCsv(text: string, file: string, pointer: string): RasterOutcome {
  const table = readTable(text, file, pointer, RASTER_COLUMNS);
  if (!table.ok) return table;
  const errors: Finding[] = [];
  const rows = numericRows(table, file, pointer, RASTER_COLUMNS, errors);
  const at = (line: number, message: string): Finding => ({ path: pointer, file, line, column: 1, message });
  const cells = new Map<string, { mu_s: number; mu_k: number; line: number }>();
  let ni = 0;
  let nj = 0;
  for (const { values, line } of rows) {
    const [i, j, mu_s, mu_k] = values;
    if (!Number.isInteger(i) || !Number.isInteger(j) || i < 0 || j < 0 || i >= MAX_RASTER_CELLS_PER_AXIS || j >= MAX_RASTER_CELLS_PER_AXIS) {
      errors.push(at(line, `cell index (${i}, ${j}) is not a whole number from 0 to ${MAX_RASTER_CELLS_PER_AXIS - 1}`));
      continue;
    }
    if (mu_s < 0 || mu_s > 10 || mu_k < 0 || mu_k > 10) errors.push(at(line, `friction (${mu_s}, ${mu_k}) is out of range (expected 0 to 10)`));
    if (mu_k > mu_s) errors.push(at(line, `kinetic friction ${mu_k} exceeds static friction ${mu_s} in cell (${i}, ${j}) (expected kineticFriction ≤ staticFriction)`));
    const key = `${i},${j}`;
    const earlier = cells.get(key);
    if (earlier) errors.push(at(line, `cell (${i}, ${j}) is given twice (also on line ${earlier.line})`));
    cells.set(key, { mu_s, mu_k, line });
    ni = Math.max(ni, i + 1);
    nj = Math.max(nj, j + 1);
  }
  if (errors.length === 0 && cells.size === 0) errors.push(at(table.header.line, 'the raster file has no cells'));
  const staticFriction: number[][] = [];
  const kineticFriction: number[][] = [];
  if (errors.length === 0) {
    const missing: string[] = [];
    for (let i = 0; i < ni; i++) {
      staticFriction.push([]);
      kineticFriction.push([]);
      for (let j = 0; j < nj; j++) {
        const c = cells.get(`${i},${j}`);
        if (!c) missing.push(`(${i}, ${j})`);
        staticFriction[i].push(c?.mu_s ?? 0);
        kineticFriction[i].push(c?.mu_k ?? 0);
      }
    }
    if (missing.length) {
      errors.push(at(table.header.line, `the ${ni}×${nj} grid lacks cell${missing.length > 1 ? 's' : ''} ${missing.slice(0, 5).join(', ')}${missing.length > 5 ? ` and ${missing.length - 5} more` : ''} (expected every cell exactly once)`));
    }
  }
  return errors.length ? { ok: false, errors } : { ok: true, staticFriction, kineticFriction };
}
