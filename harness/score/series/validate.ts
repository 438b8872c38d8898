// A series file read back is data from disk, maybe damaged or crafted: it is checked against the
// shape the report's plots index into (JSON Schema via ajv, then the lengths that must agree with
// the bucket times) before any plot sees it. A bad file costs its own run its plots ("series
// unusable: …"), never the report.

import { Ajv2020, type ErrorObject, type ValidateFunction } from 'ajv/dist/2020.js';
import { MAX_RASTER_CELLS_PER_SIDE, MAX_SERIES_EVENTS, MAX_SERIES_POINTS, MAX_TELEMETRY_SERIES, SERIES_FORMAT, SERIES_FORMAT_VERSION, type RunSeries } from './types.js';

// Magnitudes are bounded as well as types: the plots size axes, grids and histograms from these
// numbers, and a crafted 1e308 would ask for a grid line per metre to the end of the universe.
/** Positions on the floor, m: a one-hour run at 10 m/s is 36 km. */
const position = { type: 'number', minimum: -1e5, maximum: 1e5 } as const;
/** Times within a run, s (runs are at most an hour). */
const time = { type: 'number', minimum: 0, maximum: 1e5 } as const;
/** Any other plotted value: forces in N, friction use, governor references. */
const num = { type: 'number', minimum: -1e9, maximum: 1e9 } as const;
const nonNegative = { type: 'number', minimum: 0, maximum: 1e9 } as const;
const nums = { type: 'array', items: num, maxItems: MAX_SERIES_POINTS } as const;
const positions = { type: 'array', items: position, maxItems: MAX_SERIES_POINTS } as const;
const times = { type: 'array', items: time, maxItems: MAX_SERIES_POINTS } as const;
const nullableNums = { type: 'array', items: { type: ['number', 'null'], minimum: -1e9, maximum: 1e9 }, maxItems: MAX_SERIES_POINTS } as const;
const minMax = { type: 'object', required: ['min', 'max'], properties: { min: nullableNums, max: nullableNums } } as const;
const xy = { type: 'array', items: position, minItems: 2, maxItems: 2 } as const;
const coefficient = { type: 'number', minimum: 0, maximum: 100 } as const;
const material = {
  type: 'object',
  required: ['staticFriction', 'kineticFriction'],
  properties: { name: { type: 'string' }, staticFriction: coefficient, kineticFriction: coefficient },
} as const;
const grid = { type: 'array', maxItems: MAX_RASTER_CELLS_PER_SIDE, items: { type: 'array', maxItems: MAX_RASTER_CELLS_PER_SIDE, items: coefficient } } as const;

const SERIES_SCHEMA = {
  type: 'object',
  required: ['format', 'formatVersion', 'scenario', 'build', 'footCount', 'bucketTicks', 't_s', 'feet', 'trunk', 'footholds', 'slips', 'dropped', 'governor', 'loopTime', 'friction', 'controlPeriod_s', 'loadedThreshold_N', 'slipSpeed_mps'],
  properties: {
    format: { const: SERIES_FORMAT },
    formatVersion: { const: SERIES_FORMAT_VERSION },
    scenario: { type: 'object', required: ['id', 'hash'], properties: { id: { type: 'string' }, hash: { type: 'string' } } },
    build: { type: 'string' },
    footCount: { type: 'integer', minimum: 1, maximum: 64 },
    loadedThreshold_N: nonNegative,
    slipSpeed_mps: nonNegative,
    controlPeriod_s: { type: 'number', exclusiveMinimum: 0, maximum: 100 },
    bucketTicks: { type: 'integer', minimum: 1, maximum: 1e9 },
    t_s: times,
    feet: {
      type: 'array',
      maxItems: 64,
      items: {
        type: 'object',
        required: ['frictionUse', 'normalForce_N', 'stance', 'slipping', 'slipDistance_m'],
        properties: { frictionUse: minMax, normalForce_N: minMax, stance: { type: 'array', items: { type: 'number', minimum: 0, maximum: 1 }, maxItems: MAX_SERIES_POINTS }, slipping: { type: 'array', items: { enum: [0, 1] }, maxItems: MAX_SERIES_POINTS }, slipDistance_m: { type: 'array', items: nonNegative, maxItems: MAX_SERIES_POINTS } },
      },
    },
    trunk: { type: 'object', required: ['x_m', 'y_m', 'referenceX_m', 'referenceY_m'], properties: { x_m: positions, y_m: positions, referenceX_m: positions, referenceY_m: positions } },
    footholds: {
      type: 'array',
      maxItems: 100_000,
      items: { type: 'object', required: ['foot', 't_s', 'x_m', 'y_m'], properties: { foot: { type: 'integer', minimum: 0 }, t_s: time, x_m: position, y_m: position } },
    },
    slips: {
      type: 'array',
      maxItems: 100_000,
      items: {
        type: 'object',
        required: ['foot', 'start_s', 'end_s', 'from_m', 'to_m', 'distance_m'],
        properties: { foot: { type: 'integer', minimum: 0 }, start_s: time, end_s: time, from_m: xy, to_m: xy, distance_m: { type: 'number', minimum: 0, maximum: 1e5 } },
      },
    },
    dropped: { type: 'object', required: ['footholds', 'slips'], properties: { footholds: { type: 'integer', minimum: 0 }, slips: { type: 'integer', minimum: 0 }, telemetry: { type: 'integer', minimum: 0 } } },
    telemetry: {
      type: 'array',
      maxItems: MAX_TELEMETRY_SERIES,
      items: {
        type: 'object',
        required: ['name', 'values', 'min', 'max'],
        // min/max are the exact extremes, shown as text, never used to size a plot.
        properties: { name: { type: 'string', minLength: 1, maxLength: 120 }, values: minMax, min: { type: ['number', 'null'] }, max: { type: ['number', 'null'] } },
      },
    },
    governor: {
      type: 'array',
      maxItems: 64,
      items: { type: 'object', required: ['axis', 'target', 'applied'], properties: { axis: { type: 'string' }, target: minMax, applied: minMax } },
    },
    loopTime: {
      type: 'object',
      required: ['start_us', 'ratio', 'bins', 'ticks', 'budget_us'],
      properties: {
        // Loop times from 1 ns to 1000 s in bins at least 0.1 % wide: a few thousand bins at most.
        start_us: { type: 'number', minimum: 1e-3, maximum: 1e6 },
        ratio: { type: 'number', minimum: 1.001, maximum: 10 },
        bins: {
          type: 'array',
          maxItems: 10_000,
          items: { type: 'array', minItems: 2, maxItems: 2, prefixItems: [{ type: 'integer', minimum: 0, maximum: 10_000 }, { type: 'integer', minimum: 0, maximum: 1e12 }] },
        },
        ticks: { type: 'integer', minimum: 0, maximum: 1e12 },
        // A budget is positive (scenario schema: exclusiveMinimum 0): the plot's log axis needs it.
        budget_us: { type: 'number', minimum: 1e-3, maximum: 1e9 },
      },
    },
    events: {
      type: 'array',
      maxItems: MAX_SERIES_EVENTS,
      items: { type: 'object', required: ['t_s', 'kind', 'text'], properties: { t_s: time, kind: { enum: ['push', 'command'] }, text: { type: 'string', maxLength: 200 } } },
    },
    legNames: { type: 'array', maxItems: 64, items: { type: 'string', minLength: 1, maxLength: 40 } },
    friction: {
      type: 'object',
      required: ['default', 'patches'],
      properties: {
        default: material,
        patches: {
          type: 'array',
          maxItems: 10_000,
          items: {
            type: 'object',
            required: ['shape', 'material'],
            properties: {
              name: { type: 'string' },
              material,
              shape: {
                type: 'object',
                required: ['kind'],
                oneOf: [
                  { required: ['min_m', 'max_m'], properties: { kind: { const: 'rect' }, min_m: xy, max_m: xy } },
                  { required: ['center_m', 'radius_m'], properties: { kind: { const: 'circle' }, center_m: xy, radius_m: { type: 'number', minimum: 0, maximum: 1e5 } } },
                  { required: ['vertices_m'], properties: { kind: { const: 'polygon' }, vertices_m: { type: 'array', minItems: 3, maxItems: 10_000, items: xy } } },
                ],
              },
            },
          },
        },
        raster: {
          type: 'object',
          required: ['origin_m', 'cell_m', 'staticFriction', 'kineticFriction'],
          properties: { origin_m: xy, cell_m: { type: 'number', minimum: 1e-3, maximum: 1e5 }, staticFriction: grid, kineticFriction: grid },
        },
      },
    },
  },
} as const;

/** The longest loop time a series may bin, µs (1000 s: far beyond any control period). */
export const MAX_LOOP_TIME_us = 1e9;

let compiled: ValidateFunction | undefined;

function validator(): ValidateFunction {
  compiled ??= new Ajv2020({ allErrors: false, strict: false }).compile(SERIES_SCHEMA);
  return compiled;
}

function describe(error: ErrorObject): string {
  return `${error.instancePath || '/'} ${error.message ?? 'is invalid'}`;
}

/** The series, or what is wrong with it first (a JSON pointer and the expectation). */
export function validateSeries(value: unknown): { ok: true; series: RunSeries } | { ok: false; problem: string } {
  const check = validator();
  if (!check(value)) return { ok: false, problem: describe((check.errors ?? [])[0]) };
  const series = value as RunSeries;
  const buckets = series.t_s.length;
  if (series.feet.length !== series.footCount) return { ok: false, problem: `/feet holds ${series.feet.length} feet, footCount says ${series.footCount}` };
  const lengths: [string, unknown[]][] = [
    ['/trunk/x_m', series.trunk.x_m],
    ['/trunk/y_m', series.trunk.y_m],
    ['/trunk/referenceX_m', series.trunk.referenceX_m],
    ['/trunk/referenceY_m', series.trunk.referenceY_m],
  ];
  series.feet.forEach((foot, i) => {
    for (const key of ['stance', 'slipping', 'slipDistance_m'] as const) lengths.push([`/feet/${i}/${key}`, foot[key]]);
    for (const key of ['frictionUse', 'normalForce_N'] as const) lengths.push([`/feet/${i}/${key}/min`, foot[key].min], [`/feet/${i}/${key}/max`, foot[key].max]);
  });
  series.governor.forEach((axis, i) => {
    for (const key of ['target', 'applied'] as const) lengths.push([`/governor/${i}/${key}/min`, axis[key].min], [`/governor/${i}/${key}/max`, axis[key].max]);
  });
  for (const [pointer, list] of lengths) {
    if (list.length !== buckets) return { ok: false, problem: `${pointer} has ${list.length} values, t_s has ${buckets} buckets` };
  }
  // Bin edges must stay on the plot's log axis (1 ns to 1000 s): start_us·ratio^k for the last bin.
  const lt = series.loopTime;
  const bad = lt.bins.findIndex(([k]) => !(lt.start_us * lt.ratio ** (k + 1) <= MAX_LOOP_TIME_us));
  if (bad >= 0) return { ok: false, problem: `/loopTime/bins/${bad} bin ${lt.bins[bad][0]} ends beyond ${MAX_LOOP_TIME_us} µs (start_us ${lt.start_us}, ratio ${lt.ratio})` };
  for (const [key, list] of [['footholds', series.footholds], ['slips', series.slips]] as const) {
    const bad = list.findIndex((item) => item.foot >= series.footCount);
    if (bad >= 0) return { ok: false, problem: `/${key}/${bad}/foot names foot ${list[bad].foot} of ${series.footCount}` };
  }
  return { ok: true, series };
}
