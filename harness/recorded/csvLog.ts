// CSV logs: one row per sample, a header naming the columns the map refers to. Streamed in 1 MB
// chunks so an hour at 1 kHz never sits in memory as text; numbers go straight into typed
// columns. csv-parse reads the header and every line with a quote or a comment mark; a line with
// neither is plain RFC 4180 (fields separated by commas, nothing to unquote), so it is split
// directly — the same cells, about five times faster on hour-long logs. Refused with the file and line: a mapped column missing from the header, a column
// whose name spells another unit than the map, a cell that is not a number, time that does not
// strictly increase.

import { createReadStream, statSync } from 'node:fs';
import { parse } from 'csv-parse/sync';
import { closest } from 'fastest-levenshtein';
import { ColumnStore } from './columns.js';
import { textValue, type SlotLayout } from './layout.js';
import type { LoadedLogMap } from './map.js';
import { MAX_REPORTED_ROWS, type ProgressCallback, type ReadResult } from './rawLog.js';
import { UNIT_FACTORS, unitMismatch } from './units.js';

const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

export async function readCsvLog(file: string, display: string, loaded: LoadedLogMap, layout: SlotLayout, onProgress?: ProgressCallback): Promise<ReadResult> {
  const slots = layout.slots;
  const timeFactor = UNIT_FACTORS.time[loaded.map.time.unit];
  const store = new ColumnStore(slots.length + 1); // last column: the sample's line number
  const lineColumn = slots.length;
  const errors: string[] = [];
  let index: number[] | undefined;
  const bounds = new Int32Array(4097); // field starts of a plain line (up to 4096 columns)
  let previousTime = Number.NEGATIVE_INFINITY;
  let previousLine = 0;
  let total = 0;
  try {
    total = statSync(file).size;
  } catch {
    // Unknown size: no progress fractions.
  }
  let bytes = 0;
  let reported = 0;
  const stream = createReadStream(file, { highWaterMark: 1 << 20, encoding: 'utf8' });
  stream.on('data', (chunk) => {
    bytes += chunk.length;
    if (onProgress && total > 0 && bytes - reported > total / 100) {
      reported = bytes;
      onProgress(bytes / total);
    }
  });
  try {
    rows: for await (const batch of csvLines(stream)) for (const item of batch) {
      const info = { lines: item.line };
      if (index === undefined) {
        index = [];
        const known = item.record ?? item.text!.split(',').map((c) => c.trim());
        for (const slot of slots) {
          const at = known.indexOf(slot.column!);
          if (at < 0) {
            const hint = known.length ? ` (did you mean "${closest(slot.column!, known)}"?)` : '';
            errors.push(`${display}:${info.lines}: missing column "${slot.column}" mapped at ${loaded.where(slot.pointer)}${hint}`);
          } else if (slot.dimension && slot.unit) {
            const mismatch = unitMismatch(slot.column!, slot.unit, slot.dimension);
            if (mismatch) errors.push(`${display}:${info.lines}: ${mismatch} (map: ${loaded.where(slot.pointer.replace(/\/csv\/\d+$/, '/unit'))})`);
          }
          index.push(at);
        }
        if (errors.length) break rows;
        continue;
      }
      const row = store.addRow();
      const columns = store.columns;
      columns[lineColumn][row] = info.lines;
      const text = item.text;
      let fields: number;
      if (text !== undefined) {
        // Plain line: field k spans [bounds[k], bounds[k + 1] − 1).
        fields = 0;
        bounds[0] = 0;
        for (let at = text.indexOf(','); at >= 0; at = text.indexOf(',', at + 1)) {
          if (fields + 2 >= bounds.length) break;
          bounds[++fields] = at + 1;
        }
        fields++;
        bounds[fields] = text.length + 1;
      } else fields = item.record!.length;
      for (let s = 0; s < slots.length; s++) {
        const k = index[s];
        if (k >= fields) {
          errors.push(`${display}:${info.lines}: row has ${fields} cells, column "${slots[s].column}" is number ${k + 1}`);
          break;
        }
        let value = text !== undefined ? parseDecimal(text, bounds[k], bounds[k + 1] - 1) : Number.NaN;
        if (Number.isNaN(value)) {
          const cell = text !== undefined ? text.slice(bounds[k], bounds[k + 1] - 1).trim() : item.record![k];
          const kind = slots[s].text;
          const parsed = NUMBER.test(cell) ? Number(cell) : kind ? textValue(kind, cell) : undefined;
          if (parsed === undefined || !Number.isFinite(parsed)) {
            errors.push(`${display}:${info.lines}: column "${slots[s].column}" holds ${JSON.stringify(cell)} (expected a number${kind === 'gait' ? ', stand or trot' : kind === 'flag' ? ', true or false' : ''})`);
            continue;
          }
          value = parsed;
        }
        columns[s][row] = value;
      }
      const t = columns[layout.time!][row] * timeFactor;
      if (!(t > previousTime) && errors.length < MAX_REPORTED_ROWS) {
        errors.push(`${display}:${info.lines}: time ${columns[layout.time!][row]} ${loaded.map.time.unit} does not increase (line ${previousLine} has ${previousTime / timeFactor}; expected strictly increasing sample times)`);
      }
      previousTime = t;
      previousLine = info.lines;
      if (errors.length >= MAX_REPORTED_ROWS) break rows;
    }
  } catch (e) {
    const err = e as Error & { line?: number };
    errors.push(`${display}${err.line ? `:${err.line}` : ''}: CSV: ${err.message.split('\n')[0]}`);
  } finally {
    stream.destroy();
  }
  if (index === undefined && errors.length === 0) errors.push(`${display}: the log is empty (expected a header and one row per sample)`);
  if (errors.length) return { ok: false, errors: errors.length >= MAX_REPORTED_ROWS ? [...errors, `${display}: stopped after ${MAX_REPORTED_ROWS} problems`] : errors };
  if (store.count < 2) return { ok: false, errors: [`${display}: ${store.count} sample${store.count === 1 ? '' : 's'} (expected at least 2)`] };
  const columns = store.finish();
  const lines = columns[lineColumn];
  const time_s = new Float64Array(store.count);
  const rawTime = columns[layout.time!];
  for (let i = 0; i < store.count; i++) time_s[i] = rawTime[i] * timeFactor;
  return { ok: true, log: { display, count: store.count, time_s, values: columns.slice(0, slots.length), where: (k) => `${display}:${lines[k]}` } };
}

const CSV_OPTIONS = { comment: '#', skip_empty_lines: true, trim: true, relax_column_count: true } as const;

/** A line of the log: plain text (no quote, no comment mark) or the record csv-parse made of it. */
interface CsvLine {
  line: number;
  text?: string;
  record?: string[];
}

/**
 * The lines of a CSV stream with their line numbers, a batch per chunk read. One record per line:
 * a quoted field that spans lines is not supported in logs (refused with its line), which every
 * logger we know of obeys.
 */
async function* csvLines(stream: AsyncIterable<Buffer | string>): AsyncGenerator<CsvLine[]> {
  let rest = '';
  let line = 0;
  const one = (text: string): CsvLine | null => {
    if (text.indexOf('"') < 0 && text.indexOf('#') < 0) return text.trim() === '' ? null : { line, text };
    let records: string[][];
    try {
      records = parse(text, CSV_OPTIONS) as string[][];
    } catch (e) {
      throw Object.assign(new Error((e as Error).message), { line });
    }
    return records.length === 0 ? null : { line, record: records[0] };
  };
  for await (const chunk of stream) {
    const text = rest + (typeof chunk === 'string' ? chunk : chunk.toString('utf8'));
    const batch: CsvLine[] = [];
    let start = 0;
    for (let end = text.indexOf('\n', start); end >= 0; end = text.indexOf('\n', start)) {
      line++;
      const item = one(text.charCodeAt(end - 1) === 13 ? text.slice(start, end - 1) : text.slice(start, end));
      start = end + 1;
      if (item) batch.push(item);
    }
    rest = text.slice(start);
    yield batch;
  }
  if (rest.length > 0) {
    line++;
    const item = one(rest);
    if (item) yield [item];
  }
}

const EXACT_POWERS = Array.from({ length: 23 }, (_, k) => Number(`1e${k}`));

/**
 * The decimal number in text[start, end) (spaces around it allowed), or NaN when the field is not
 * one. Exact: at most 15 significant digits and a power of ten up to 10^22 are both exact doubles,
 * so one division or multiplication rounds correctly (Clinger, "How to read floating point numbers
 * accurately", PLDI 1990); anything longer goes to Number().
 */
export function parseDecimal(text: string, start: number, end: number): number {
  while (start < end && text.charCodeAt(start) === 32) start++;
  while (end > start && text.charCodeAt(end - 1) === 32) end--;
  if (start >= end) return Number.NaN;
  let at = start;
  let negative = false;
  const first = text.charCodeAt(at);
  if (first === 45 || first === 43) {
    negative = first === 45;
    at++;
  }
  let mantissa = 0;
  let digits = 0;
  let significant = 0;
  let fraction = 0;
  let c = text.charCodeAt(at);
  while (at < end && c >= 48 && c <= 57) {
    mantissa = mantissa * 10 + (c - 48);
    digits++;
    if (mantissa > 0) significant++;
    c = text.charCodeAt(++at);
  }
  if (at < end && c === 46) {
    c = text.charCodeAt(++at);
    while (at < end && c >= 48 && c <= 57) {
      mantissa = mantissa * 10 + (c - 48);
      digits++;
      fraction++;
      if (mantissa > 0) significant++;
      c = text.charCodeAt(++at);
    }
  }
  if (digits === 0) return Number.NaN;
  let exponent = 0;
  if (at < end && (c === 101 || c === 69)) {
    const slice = text.slice(start, end);
    return NUMBER.test(slice) ? Number(slice) : Number.NaN;
  }
  if (at !== end) return Number.NaN;
  if (significant > 15) return Number(text.slice(start, end));
  exponent -= fraction;
  const value = exponent >= 0 ? (exponent <= 22 ? mantissa * EXACT_POWERS[exponent] : Number(text.slice(start, end))) : -exponent <= 22 ? mantissa / EXACT_POWERS[-exponent] : Number(text.slice(start, end));
  return negative ? -value : value;
}
