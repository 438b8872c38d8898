// CSV logs: one row per sample, a header naming the columns the map refers to. Streamed through
// csv-parse so an hour at 1 kHz never sits in memory as text; numbers go straight into typed
// columns. Refused with the file and line: a mapped column missing from the header, a column
// whose name spells another unit than the map, a cell that is not a number, time that does not
// strictly increase.

import { createReadStream, statSync } from 'node:fs';
import { parse } from 'csv-parse';
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
  const stream = createReadStream(file, { highWaterMark: 1 << 20 });
  stream.on('data', (chunk) => {
    bytes += chunk.length;
    if (onProgress && total > 0 && bytes - reported > total / 100) {
      reported = bytes;
      onProgress(bytes / total);
    }
  });
  const parser = stream.pipe(parse({ comment: '#', skip_empty_lines: true, trim: true, relax_column_count: true, info: true }));
  try {
    for await (const item of parser as AsyncIterable<{ record: string[]; info: { lines: number } }>) {
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
        if (errors.length) break;
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
      if (errors.length >= MAX_REPORTED_ROWS) break;
    }
  } catch (e) {
    const err = e as Error & { lines?: number };
    errors.push(`${display}${err.lines ? `:${err.lines}` : ''}: CSV: ${err.message.split('\n')[0]}`);
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
