// Friction raster CSV (i,j,staticFriction,kineticFriction, one row per cell) scanned straight from
// the file's bytes: no per-cell records, strings or maps, so a 1000 × 1000 raster costs its two
// grids and one line index (typed arrays) instead of a million parsed rows. Accepts what the
// general CSV reader accepted for these files (header in any column order, `#` comments, blank
// lines, spaces around fields, LF / CRLF / CR line ends); a file with quotes goes to that reader.

import type { Finding } from '../files/issue.js';
import { hintFor } from '../files/suggest.js';
import { MAX_RASTER_CELLS_PER_AXIS, parseRasterCsv, RASTER_COLUMNS, type RasterOutcome } from './series.js';

const COMMA = 0x2c;
const LF = 0x0a;
const CR = 0x0d;
const HASH = 0x23;
const QUOTE = 0x22;
const SPACE = 0x20;
const TAB = 0x09;
const ZERO = 0x30;
const NINE = 0x39;
const DOT = 0x2e;
const PLUS = 0x2b;
const MINUS = 0x2d;
const E_LOWER = 0x65;
const E_UPPER = 0x45;

/** Errors kept per file: a wholly wrong million-row file must not build a million messages. */
export const MAX_RASTER_ERRORS = 50;

/** Exact powers of ten: every 10^k with k ≤ 22 is a double, so m·10^k or m/10^k rounds once. */
const POW10 = Array.from({ length: 23 }, (_, k) => Number(`1e${k}`));

const latin1 = new TextDecoder('latin1');
// A byte-order mark is kept, as the text reader keeps it (it then names an unknown column).
const utf8 = new TextDecoder('utf-8', { ignoreBOM: true });

/**
 * The decimal number in bytes[start, end) as `Number(text)` gives it, or NaN when the text is not
 * a plain decimal (the grammar of the series reader: [+-]digits[.digits][e[+-]digits]).
 * Up to 15 significant digits and a power of ten within ±22 are converted exactly by one IEEE
 * multiply or divide (Clinger 1990, "How to read floating point numbers accurately", the fast
 * path); anything longer goes through Number() on the text, so the value is always identical.
 */
export function scanDecimal(bytes: Uint8Array, start: number, end: number): number {
  let p = start;
  let negative = false;
  if (p < end && (bytes[p] === PLUS || bytes[p] === MINUS)) {
    negative = bytes[p] === MINUS;
    p++;
  }
  let mantissa = 0;
  let digits = 0;
  let significant = 0;
  let scale = 0;
  while (p < end && bytes[p] >= ZERO && bytes[p] <= NINE) {
    if (significant > 0 || bytes[p] !== ZERO) significant++;
    mantissa = mantissa * 10 + (bytes[p] - ZERO);
    digits++;
    p++;
  }
  if (p < end && bytes[p] === DOT) {
    p++;
    while (p < end && bytes[p] >= ZERO && bytes[p] <= NINE) {
      if (significant > 0 || bytes[p] !== ZERO) significant++;
      mantissa = mantissa * 10 + (bytes[p] - ZERO);
      digits++;
      scale--;
      p++;
    }
  }
  if (digits === 0) return Number.NaN;
  let exponent = 0;
  if (p < end && (bytes[p] === E_LOWER || bytes[p] === E_UPPER)) {
    p++;
    let expNegative = false;
    if (p < end && (bytes[p] === PLUS || bytes[p] === MINUS)) {
      expNegative = bytes[p] === MINUS;
      p++;
    }
    let expDigits = 0;
    while (p < end && bytes[p] >= ZERO && bytes[p] <= NINE) {
      // Capped: only whether it is huge matters, and the slow path reads it again.
      if (exponent < 100000) exponent = exponent * 10 + (bytes[p] - ZERO);
      expDigits++;
      p++;
    }
    if (expDigits === 0) return Number.NaN;
    if (expNegative) exponent = -exponent;
  }
  if (p !== end) return Number.NaN;
  const power = scale + exponent;
  if (significant <= 15 && power >= -22 && power <= 22) {
    // mantissa < 10^15 < 2^53: exact, as is 10^|power|; one rounding, as Number() does.
    const value = power >= 0 ? mantissa * POW10[power] : mantissa / POW10[-power];
    return negative ? -value : value;
  }
  return Number(latin1.decode(bytes.subarray(start, end)));
}

interface Field {
  start: number;
  end: number;
}

/**
 * One row per cell (i = x index, j = y index, from 0); every cell of the grid exactly once.
 * Same values and messages as `parseRasterCsv` (series.ts), with the line of every bad row.
 */
export function scanRasterCsv(bytes: Uint8Array, file: string, pointer: string): RasterOutcome {
  if (bytes.includes(QUOTE)) return parseRasterCsv(utf8.decode(bytes), file, pointer);
  const errors: Finding[] = [];
  const at = (line: number, message: string, hint?: string): Finding => ({ path: pointer, file, line, column: 1, message, hint });
  // As the CSV reader orders them: every row-shape and number problem, then the cell problems.
  const rowErrors: Finding[] = [];
  const cellErrors: Finding[] = [];
  const rowProblem = (finding: Finding) => {
    if (rowErrors.length < MAX_RASTER_ERRORS) rowErrors.push(finding);
  };
  const push = (finding: Finding) => {
    if (cellErrors.length < MAX_RASTER_ERRORS) cellErrors.push(finding);
  };
  const side = MAX_RASTER_CELLS_PER_AXIS;
  // Indexed i·side + j until the grid's extent is known; line 0 = cell not given.
  let mu_s: Float64Array | undefined;
  let mu_k: Float64Array | undefined;
  let lineOf: Int32Array | undefined;
  const fields: Field[] = [];
  let header: string[] | undefined;
  let headerLine = 0;
  let columnOf: number[] = [];
  let rowsSeen = 0;
  let cells = 0;
  let ni = 0;
  let nj = 0;
  let line = 0;
  let p = 0;
  const n = bytes.length;
  const values = [0, 0, 0, 0];
  while (p < n) {
    line++;
    // One physical line: fields split on commas, trimmed, ending at a comment or line end.
    fields.length = 0;
    let fieldStart = p;
    let lineEnd = p;
    let commentAt = -1;
    while (lineEnd < n && bytes[lineEnd] !== LF && bytes[lineEnd] !== CR) {
      if (bytes[lineEnd] === HASH && commentAt < 0) commentAt = lineEnd;
      lineEnd++;
    }
    const contentEnd = commentAt >= 0 ? commentAt : lineEnd;
    for (let q = p; q <= contentEnd; q++) {
      if (q === contentEnd || bytes[q] === COMMA) {
        let s = fieldStart;
        let e = q;
        while (s < e && (bytes[s] === SPACE || bytes[s] === TAB)) s++;
        while (e > s && (bytes[e - 1] === SPACE || bytes[e - 1] === TAB)) e--;
        fields.push({ start: s, end: e });
        fieldStart = q + 1;
      }
    }
    p = lineEnd + 1;
    if (lineEnd < n && bytes[lineEnd] === CR && p < n && bytes[p] === LF) p++;
    const blank = fields.length === 1 && fields[0].start === fields[0].end;
    if (blank) continue;

    if (header === undefined) {
      header = fields.map((f) => utf8.decode(bytes.subarray(f.start, f.end)));
      headerLine = line;
      const known: readonly string[] = RASTER_COLUMNS;
      for (const name of header) {
        if (!known.includes(name)) errors.push(at(line, `unknown column "${name}" in the header (expected ${RASTER_COLUMNS.join(',')})`, hintFor(name, known)));
      }
      for (const name of RASTER_COLUMNS) {
        if (!header.includes(name)) errors.push(at(line, `missing column "${name}" in the header (expected ${RASTER_COLUMNS.join(',')})`));
      }
      const duplicated = header.filter((c, k) => header!.indexOf(c) !== k);
      if (duplicated.length) errors.push(at(line, `column ${duplicated.map((d) => `"${d}"`).join(', ')} appears twice in the header`));
      if (errors.length) return { ok: false, errors };
      columnOf = RASTER_COLUMNS.map((c) => header!.indexOf(c));
      mu_s = new Float64Array(side * side);
      mu_k = new Float64Array(side * side);
      lineOf = new Int32Array(side * side);
      continue;
    }

    rowsSeen++;
    if (fields.length !== header.length) {
      rowProblem(at(line, `row has ${fields.length} cells, the header has ${header.length}`));
      continue;
    }
    let good = true;
    for (let k = 0; k < 4; k++) {
      const f = fields[columnOf[k]];
      const value = scanDecimal(bytes, f.start, f.end);
      if (!Number.isFinite(value)) {
        rowProblem(at(line, `${RASTER_COLUMNS[k]} ${JSON.stringify(utf8.decode(bytes.subarray(f.start, f.end)))} is not a finite number`));
        good = false;
      }
      values[k] = value;
    }
    if (!good) continue;
    const [i, j, s, k] = values;
    if (!Number.isInteger(i) || !Number.isInteger(j) || i < 0 || j < 0 || i >= side || j >= side) {
      push(at(line, `cell index (${i}, ${j}) is not a whole number from 0 to ${side - 1}`));
      continue;
    }
    if (s < 0 || s > 10 || k < 0 || k > 10) push(at(line, `friction (${s}, ${k}) is out of range (expected 0 to 10)`));
    if (k > s) push(at(line, `kinetic friction ${k} exceeds static friction ${s} in cell (${i}, ${j}) (expected kineticFriction ≤ staticFriction)`));
    const cell = i * side + j;
    if (lineOf![cell] !== 0) push(at(line, `cell (${i}, ${j}) is given twice (also on line ${lineOf![cell]})`));
    else cells++;
    mu_s![cell] = s;
    mu_k![cell] = k;
    lineOf![cell] = line;
    if (i + 1 > ni) ni = i + 1;
    if (j + 1 > nj) nj = j + 1;
  }
  if (header === undefined) {
    return { ok: false, errors: [at(1, `the CSV file is empty (expected a header ${RASTER_COLUMNS.join(',')} and data rows)`)] };
  }
  errors.push(...rowErrors, ...cellErrors.slice(0, MAX_RASTER_ERRORS - rowErrors.length));
  if (errors.length) return { ok: false, errors };
  if (rowsSeen === 0 || cells === 0) return { ok: false, errors: [at(headerLine, 'the raster file has no cells')] };
  const missing: string[] = [];
  let missingCount = 0;
  const staticFriction: number[][] = [];
  const kineticFriction: number[][] = [];
  for (let i = 0; i < ni; i++) {
    const sRow = new Array<number>(nj);
    const kRow = new Array<number>(nj);
    for (let j = 0; j < nj; j++) {
      const cell = i * side + j;
      if (lineOf![cell] === 0) {
        missingCount++;
        if (missing.length < 5) missing.push(`(${i}, ${j})`);
      }
      sRow[j] = mu_s![cell];
      kRow[j] = mu_k![cell];
    }
    staticFriction.push(sRow);
    kineticFriction.push(kRow);
  }
  if (missingCount) {
    const more = missingCount > 5 ? ` and ${missingCount - 5} more` : '';
    return { ok: false, errors: [at(headerLine, `the ${ni}×${nj} grid lacks cell${missingCount > 1 ? 's' : ''} ${missing.join(', ')}${more} (expected every cell exactly once)`)] };
  }
  return { ok: true, staticFriction, kineticFriction };
}
