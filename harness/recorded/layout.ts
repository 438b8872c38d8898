// From a log map to a flat list of slots (one per scalar read from the log), for one log format.
// The readers fill one column per slot; convert.ts turns the columns into the trajectory. A map
// that lacks an entry the format needs is refused here, naming the map's line.

import type { Dimension } from './units.js';
import type { LoadedLogMap, LogFormat, MappedQuantity } from './map.js';

export interface Slot {
  /** Where the slot's source is written in the map (a JSON pointer), for messages. */
  pointer: string;
  /** CSV column name. */
  column?: string;
  /** MCAP topic and field path (split at dots). */
  topic?: string;
  field?: string[];
  /** Dimension and unit of the values (absent: dimensionless, e.g. a quaternion or a flag). */
  dimension?: Dimension;
  unit?: string;
  /** Text values allowed: gait names, booleans. */
  text?: 'gait' | 'flag';
}

export interface FootSlots {
  position: number;
  force: number;
  velocity: number | null;
  contact: number | null;
}

/** Slot indices: the first of each quantity's consecutive components. */
export interface SlotLayout {
  format: LogFormat;
  slots: Slot[];
  /** CSV: the time column's slot; MCAP: null (message times). */
  time: number | null;
  trunkPosition: number;
  trunkOrientation: number;
  trunkVelocity: number;
  feet: FootSlots[];
  commandVelocity: number;
  commandYawRate: number;
  commandGait: number | null;
  externalForce: number | null;
}

export type LayoutResult = { ok: true; layout: SlotLayout } | { ok: false; errors: string[] };

export function buildLayout(loaded: LoadedLogMap, format: LogFormat): LayoutResult {
  const { map } = loaded;
  const slots: Slot[] = [];
  const errors: string[] = [];

  const add = (pointer: string, quantity: MappedQuantity, components: number, dimension: Dimension | undefined, text?: Slot['text']): number => {
    const first = slots.length;
    if (format === 'csv') {
      if (!quantity.csv) errors.push(`${loaded.where(pointer)}: no csv columns mapped (needed to import a CSV log)`);
      for (let k = 0; k < components; k++) slots.push({ pointer: `${pointer}/csv/${k}`, column: quantity.csv?.[k], dimension, unit: quantity.unit, text });
    } else {
      if (!quantity.mcap) errors.push(`${loaded.where(pointer)}: no mcap topic mapped (needed to import an MCAP log)`);
      for (let k = 0; k < components; k++) {
        slots.push({ pointer: `${pointer}/mcap/fields/${k}`, topic: quantity.mcap?.topic, field: quantity.mcap?.fields[k]?.split('.'), dimension, unit: quantity.unit, text });
      }
    }
    return first;
  };

  let time: number | null = null;
  if (format === 'csv') {
    if (!map.time.csv) errors.push(`${loaded.where('/time')}: no csv time column mapped (needed to import a CSV log)`);
    time = slots.length;
    slots.push({ pointer: '/time/csv', column: map.time.csv, dimension: 'time', unit: map.time.unit });
  } else if (!map.time.mcap) {
    errors.push(`${loaded.where('/time')}: no mcap time mapped (expected mcap: logTime or publishTime)`);
  }
  const o = map.trunk.orientation;
  const layout: Omit<SlotLayout, 'slots' | 'format' | 'time'> = {
    trunkPosition: add('/trunk/position', map.trunk.position, 3, 'length'),
    trunkOrientation: add('/trunk/orientation', o, o.kind === 'quaternion' ? 4 : 3, o.kind === 'rpy' ? 'angle' : undefined),
    trunkVelocity: add('/trunk/velocity', map.trunk.velocity, 3, 'velocity'),
    feet: map.feet.map((name) => {
      const foot = map.foot[name];
      const base = `/foot/${name}`;
      return {
        position: add(`${base}/position`, foot.position, 3, 'length'),
        force: add(`${base}/force`, foot.force, 3, 'force'),
        velocity: foot.velocity ? add(`${base}/velocity`, foot.velocity, 3, 'velocity') : null,
        contact: foot.contact ? add(`${base}/contact`, foot.contact, 1, undefined, 'flag') : null,
      };
    }),
    commandVelocity: add('/command/velocity', map.command.velocity, 2, 'velocity'),
    commandYawRate: add('/command/yawRate', map.command.yawRate, 1, 'angularVelocity'),
    commandGait: map.command.gait ? add('/command/gait', map.command.gait, 1, undefined, 'gait') : null,
    externalForce: map.externalForce ? add('/externalForce', map.externalForce, 3, 'force') : null,
  };
  if (errors.length) return { ok: false, errors };
  return { ok: true, layout: { format, slots, time, ...layout } };
}

/** Gait names and their codes in the raw columns. */
export const GAIT_CODES: Readonly<Record<string, number>> = { stand: 0, trot: 1 };
export const GAIT_BY_CODE = ['stand', 'trot'] as const;

/** Reads a text cell of a gait or flag slot; undefined when it is not one. */
export function textValue(kind: 'gait' | 'flag', text: string): number | undefined {
  const t = text.trim().toLowerCase();
  if (kind === 'gait') {
    if (t in GAIT_CODES) return GAIT_CODES[t];
    const n = Number(t);
    return t !== '' && Number.isInteger(n) && n >= 0 && n < GAIT_BY_CODE.length ? n : undefined;
  }
  if (t === 'true') return 1;
  if (t === 'false') return 0;
  const n = Number(t);
  return t !== '' && Number.isFinite(n) ? (n !== 0 ? 1 : 0) : undefined;
}
