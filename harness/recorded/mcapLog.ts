// MCAP logs (the open container ROS 2 records by default), read with @mcap/core's stream reader.
// Messages JSON-encoded (messageEncoding "json"), or ROS 2 CDR (messageEncoding "cdr" with a
// "ros2msg" schema, decoded by @foxglove/rosmsg2-serialization from the definition @foxglove/rosmsg
// parses); other encodings are refused naming the topic. The trunk position topic sets the sample clock: its
// messages' log (or publish) times, strictly increasing. Every other topic is resampled onto that
// clock — linearly for numbers, holding the last value for gait and contact flags — because real
// recorders publish estimator, foot and command topics at their own rates.

import { createReadStream, statSync } from 'node:fs';
import { McapStreamReader } from '@mcap/core';
import { parse as parseMessageDefinition } from '@foxglove/rosmsg';
import { MessageReader } from '@foxglove/rosmsg2-serialization';
import type { SlotLayout } from './layout.js';
import { textValue } from './layout.js';
import type { LoadedLogMap } from './map.js';
import { MAX_REPORTED_ROWS, type ProgressCallback, type ReadResult } from './rawLog.js';
import { unitMismatch } from './units.js';

interface TopicData {
  times: number[];
  /** Per slot of this topic: the values in message order. */
  values: Map<number, number[]>;
  messages: number;
}

function fieldValue(message: unknown, path: string[]): unknown {
  let node: unknown = message;
  for (const segment of path) {
    if (node === null || typeof node !== 'object') return undefined;
    node = Array.isArray(node) ? node[Number(segment)] : (node as Record<string, unknown>)[segment];
  }
  return node;
}

function describeFields(message: unknown): string {
  return message !== null && typeof message === 'object' ? Object.keys(message as object).slice(0, 12).join(', ') : typeof message;
}

export async function readMcapLog(file: string, display: string, loaded: LoadedLogMap, layout: SlotLayout, onProgress?: ProgressCallback): Promise<ReadResult> {
  const slots = layout.slots;
  const errors: string[] = [];
  const byTopic = new Map<string, number[]>();
  slots.forEach((slot, s) => {
    const list = byTopic.get(slot.topic!) ?? [];
    list.push(s);
    byTopic.set(slot.topic!, list);
    if (slot.dimension && slot.unit) {
      const name = slot.field![slot.field!.length - 1];
      const mismatch = unitMismatch(name, slot.unit, slot.dimension);
      if (mismatch) errors.push(`${display}: topic ${slot.topic} field ${slot.field!.join('.')}: ${mismatch} (map: ${loaded.where(slot.pointer.replace(/\/mcap\/fields\/\d+$/, '/unit'))})`);
    }
  });
  if (errors.length) return { ok: false, errors };
  const clockTopic = slots[layout.trunkPosition].topic!;
  const useLogTime = loaded.map.time.mcap === 'logTime';
  const topics = new Map<string, TopicData>();
  const channels = new Map<number, { topic: string; data: TopicData; decode: (bytes: Uint8Array) => unknown } | null>();
  const schemas = new Map<number, { name: string; encoding: string; data: Uint8Array }>();
  const seenTopics = new Set<string>();
  const decoder = new TextDecoder();
  const reader = new McapStreamReader({ validateCrcs: true });
  let total = 0;
  try {
    total = statSync(file).size;
  } catch {
    // Unknown size: no progress fractions.
  }
  let bytes = 0;
  let reported = 0;

  const handle = (record: NonNullable<ReturnType<McapStreamReader['nextRecord']>>): void => {
    if (record.type === 'Schema') {
      schemas.set(record.id, { name: record.name, encoding: record.encoding, data: record.data });
      return;
    }
    if (record.type === 'Channel') {
      seenTopics.add(record.topic);
      if (!byTopic.has(record.topic)) {
        channels.set(record.id, null);
        return;
      }
      let decode: (bytes: Uint8Array) => unknown;
      if (record.messageEncoding === 'json') {
        decode = (bytes) => JSON.parse(decoder.decode(bytes));
      } else if (record.messageEncoding === 'cdr') {
        const schema = schemas.get(record.schemaId);
        if (!schema || schema.encoding !== 'ros2msg') {
          errors.push(`${display}: topic ${record.topic} is CDR with schema encoding ${schema ? `"${schema.encoding}"` : '(none)'} (expected ros2msg, the message definition text ROS 2 records)`);
          channels.set(record.id, null);
          return;
        }
        try {
          const reader = new MessageReader(parseMessageDefinition(decoder.decode(schema.data), { ros2: true }));
          decode = (bytes) => reader.readMessage(bytes);
        } catch (e) {
          errors.push(`${display}: topic ${record.topic}: its message definition ${schema.name} does not parse (${(e as Error).message})`);
          channels.set(record.id, null);
          return;
        }
      } else {
        errors.push(`${display}: topic ${record.topic} has message encoding "${record.messageEncoding}" (expected json or cdr)`);
        channels.set(record.id, null);
        return;
      }
      let data = topics.get(record.topic);
      if (!data) {
        data = { times: [], values: new Map(byTopic.get(record.topic)!.map((s) => [s, []])), messages: 0 };
        topics.set(record.topic, data);
      }
      channels.set(record.id, { topic: record.topic, data, decode });
      return;
    }
    if (record.type !== 'Message') return;
    const channel = channels.get(record.channelId);
    if (!channel) return;
    const { data, topic } = channel;
    data.messages++;
    let message: unknown;
    try {
      message = channel.decode(record.data);
    } catch (e) {
      errors.push(`${display}: topic ${topic} message ${data.messages}: cannot be decoded (${(e as Error).message})`);
      return;
    }
    const t_s = Number(useLogTime ? record.logTime : record.publishTime) * 1e-9;
    const times = data.times;
    if (topic === clockTopic && times.length > 0 && !(t_s > times[times.length - 1])) {
      errors.push(`${display}: topic ${topic} message ${data.messages}: time ${t_s} s does not increase (message ${data.messages - 1} has ${times[times.length - 1]} s; expected strictly increasing sample times on the clock topic)`);
      return;
    }
    times.push(t_s);
    for (const [s, values] of data.values) {
      const slot = slots[s];
      const raw = fieldValue(message, slot.field!);
      let value: number | undefined;
      if (typeof raw === 'number') value = raw;
      else if (slot.text && (typeof raw === 'string' || typeof raw === 'boolean')) value = textValue(slot.text, String(raw));
      if (value === undefined || !Number.isFinite(value)) {
        const parent = fieldValue(message, slot.field!.slice(0, -1));
        errors.push(`${display}: topic ${topic} message ${data.messages}: field ${slot.field!.join('.')} is ${raw === undefined ? 'missing' : JSON.stringify(raw)} (expected a number; fields there: ${describeFields(parent)}; map: ${loaded.where(slot.pointer)})`);
        values.push(Number.NaN);
        continue;
      }
      values.push(value);
    }
  };

  const stream = createReadStream(file, { highWaterMark: 1 << 20 });
  try {
    for await (const chunk of stream as AsyncIterable<Buffer>) {
      bytes += chunk.length;
      reader.append(chunk);
      for (let record; (record = reader.nextRecord()); ) {
        handle(record);
        if (errors.length >= MAX_REPORTED_ROWS) break;
      }
      if (errors.length >= MAX_REPORTED_ROWS) break;
      if (onProgress && total > 0 && bytes - reported > total / 100) {
        reported = bytes;
        onProgress(bytes / total);
      }
    }
    if (errors.length === 0 && !reader.done()) errors.push(`${display}: the MCAP file ends before its footer (truncated?)`);
  } catch (e) {
    errors.push(`${display}: not a readable MCAP file (${(e as Error).message})`);
  } finally {
    stream.destroy();
  }
  if (errors.length) return { ok: false, errors: errors.length >= MAX_REPORTED_ROWS ? [...errors, `${display}: stopped after ${MAX_REPORTED_ROWS} problems`] : errors };

  for (const [topic, list] of byTopic) {
    const data = topics.get(topic);
    if (!data || data.times.length === 0) {
      const present = [...seenTopics].sort();
      errors.push(`${display}: missing topic ${topic} mapped at ${loaded.where(slots[list[0]].pointer.replace(/\/fields\/\d+$/, '/topic'))} (the log has ${present.length ? present.join(', ') : 'no topics'})`);
    }
  }
  if (errors.length) return { ok: false, errors };
  const clock = topics.get(clockTopic)!;
  const count = clock.times.length;
  if (count < 2) return { ok: false, errors: [`${display}: topic ${clockTopic} has ${count} message (expected at least 2)`] };
  const time_s = Float64Array.from(clock.times);
  const values: Float64Array[] = slots.map(() => new Float64Array(count));
  for (const [topic, data] of topics) {
    for (const [s, series] of data.values) resample(values[s], time_s, data.times, series, topic === clockTopic || slots[s].text !== undefined);
  }
  return { ok: true, log: { display, count, time_s, values, where: (k) => `${display} topic ${clockTopic} message ${k + 1}` } };
}

/** Values of (times, series) at `at`: linear between samples, held outside them; `hold` holds the last value instead. */
function resample(out: Float64Array, at: Float64Array, times: number[], series: number[], hold: boolean): void {
  let j = 0;
  for (let i = 0; i < at.length; i++) {
    const t = at[i];
    while (j + 1 < times.length && times[j + 1] <= t) j++;
    if (t <= times[0]) out[i] = series[0];
    else if (hold || j + 1 >= times.length) out[i] = series[j];
    else {
      const w = (t - times[j]) / (times[j + 1] - times[j]);
      out[i] = series[j] + w * (series[j + 1] - series[j]);
    }
  }
}
