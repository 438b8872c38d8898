// A build's named telemetry scalars as the report plots them, grouped by name prefix (the part
// before the first dot: `governor`, `estimator`, …), from the series file's `telemetry` field
// (score/series/types.ts TelemetrySeries: per-bucket `values`). Read defensively: a series of the
// wrong length or shape is ignored. The governor's target/applied pairs are plotted
// together from `series.governor` and are left out here.

import type { MinMaxSeries, RunSeries } from '../score/series/types.js';

export interface TelemetryScalar {
  name: string;
  values: MinMaxSeries;
}

export interface TelemetryGroup {
  prefix: string;
  scalars: TelemetryScalar[];
}

const isValues = (v: unknown): v is MinMaxSeries =>
  typeof v === 'object' && v !== null && Array.isArray((v as MinMaxSeries).min) && Array.isArray((v as MinMaxSeries).max);

export function telemetryScalars(series: RunSeries): TelemetryScalar[] {
  const raw = (series as RunSeries & { telemetry?: unknown }).telemetry;
  const out: TelemetryScalar[] = [];
  const take = (name: unknown, v: unknown) => {
    if (typeof name !== 'string' || name === '') return;
    const values = isValues(v) ? v : isValues((v as { values?: unknown } | null)?.values) ? (v as { values: MinMaxSeries }).values : null;
    if (!values || values.min.length !== series.t_s.length || values.max.length !== series.t_s.length) return;
    if (/^governor\.(target|applied)\./.test(name) && series.governor.some((g) => name.endsWith(`.${g.axis}`))) return;
    out.push({ name, values });
  };
  if (Array.isArray(raw)) for (const item of raw) take((item as { name?: unknown } | null)?.name, item);
  else if (typeof raw === 'object' && raw !== null) for (const [name, v] of Object.entries(raw)) take(name, v);
  return out;
}

export function telemetryOf(series: RunSeries): TelemetryGroup[] {
  const groups = new Map<string, TelemetryScalar[]>();
  for (const s of telemetryScalars(series)) {
    const dot = s.name.indexOf('.');
    const prefix = dot > 0 ? s.name.slice(0, dot) : s.name;
    if (!groups.has(prefix)) groups.set(prefix, []);
    (groups.get(prefix) as TelemetryScalar[]).push(s);
  }
  return [...groups.entries()].map(([prefix, scalars]) => ({ prefix, scalars }));
}
