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
      const { record, info } = item;
      if (index === undefined) {
        index = [];
        const known = record;
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
      for (let s = 0; s < slots.length; s++) {
        const cell = record[index[s]];
        let value: number | undefined;
        if (cell === undefined) {
          errors.push(`${display}:${info.lines}: row has ${record.length} cells, column "${slots[s].column}" is number ${index[s] + 1}`);
          break;
        }
        const text = slots[s].text;
        if (NUMBER.test(cell)) value = Number(cell);
        else if (text) value = textValue(text, cell);
        if (value === undefined || !Number.isFinite(value)) {
          errors.push(`${display}:${info.lines}: column "${slots[s].column}" holds ${JSON.stringify(cell)} (expected a number${text === 'gait' ? ', stand or trot' : text === 'flag' ? ', true or false' : ''})`);
          continue;
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

/**
 * The records of a CSV stream with their line numbers, a batch per chunk read. One record per line: a quoted field that
 * spans lines is not supported in logs (refused with its line), which every logger we know of obeys.
 */
async function* csvLines(stream: AsyncIterable<Buffer | string>): AsyncGenerator<{ record: string[]; info: { lines: number } }[]> {
  let rest = '';
  let line = 0;
  const one = (text: string): string[] | null => {
    if (text.indexOf('"') < 0 && text.indexOf('#') < 0) {
      if (text.trim() === '') return null;
      const cells = text.split(',');
      for (let c = 0; c < cells.length; c++) cells[c] = cells[c].trim();
      return cells;
    }
    let records: string[][];
    try {
      records = parse(text, CSV_OPTIONS) as string[][];
    } catch (e) {
      throw Object.assign(new Error((e as Error).message), { line });
    }
    return records.length === 0 ? null : records[0];
  };
  for await (const chunk of stream) {
    const text = rest + (typeof chunk === 'string' ? chunk : chunk.toString('utf8'));
    const batch: { record: string[]; info: { lines: number } }[] = [];
    let start = 0;
    for (let end = text.indexOf('\n', start); end >= 0; end = text.indexOf('\n', start)) {
      line++;
      const record = one(text.charCodeAt(end - 1) === 13 ? text.slice(start, end - 1) : text.slice(start, end));
      start = end + 1;
      if (record) batch.push({ record, info: { lines: line } });
    }
    rest = text.slice(start);
    yield batch;
  }
  if (rest.length > 0) {
    line++;
    const record = one(rest);
    if (record) yield [{ record, info: { lines: line } }];
  }
}
