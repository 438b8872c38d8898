// The per-run plot-series recorder: a TickObserver that reduces every tick to fixed-size buckets
// as it goes (memory does not grow with the run; nothing is allocated per tick except the rare
// foothold or slip-segment record), and hands back a RunSeries at the end.

import { STANCE, type Action } from '../../contract/tick.js';
import { scenarioEvents } from '../../scenario/events.js';
import type { ResolvedScenario } from '../../scenario/types.js';
import { frictionMargin } from '../frictionMargin.js';
import type { EpisodeStart, TickObserver, TickSample } from '../sample.js';
import { SlipTracker } from '../slip.js';
import { DEFAULT_SLIP_SPEED_mps, loadedThreshold_N } from '../thresholds.js';
import { MinMaxBuckets, round, ticksPerBucket } from './buckets.js';
import { compactFrictionMap } from './frictionMapData.js';
import {
  MAX_FOOTHOLDS,
  MAX_SERIES_BUCKETS,
  MAX_SERIES_EVENTS,
  MAX_SLIP_SEGMENTS,
  MAX_TELEMETRY_SERIES,
  TELEMETRY_PLOT_LIMIT,
  SERIES_FORMAT,
  SERIES_FORMAT_VERSION,
  type Foothold,
  type RunSeries,
  type SlipSegment,
  type TelemetrySeries,
} from './types.js';

/** Loop-time bins: 20 per decade from 0.1 µs to 10 s (log spacing suits a long-tailed time). */
export const LOOP_BIN_START_us = 0.1;
export const LOOP_BIN_RATIO = 10 ** (1 / 20);
export const LOOP_BIN_COUNT = 160;

const DIGITS = 5;

export interface SeriesRecorder extends TickObserver {
  finish(): RunSeries;
  /** The exact extremes of every telemetry scalar (all names, not only the plotted ones). */
  telemetryRanges(): { name: string; min: number | null; max: number | null }[];
}

export interface SeriesRecorderOptions {
  maxBuckets?: number;
  slipSpeed_mps?: number;
}

export function createSeriesRecorder(scenario: ResolvedScenario, build: string, options: SeriesRecorderOptions = {}): SeriesRecorder {
  const n = scenario.plant.robot.hips_m.length;
  const rate_Hz = scenario.control.rate_Hz;
  const expectedTicks = Math.ceil(scenario.duration_s * rate_Hz) + 1;
  const bucketTicks = ticksPerBucket(expectedTicks, options.maxBuckets ?? MAX_SERIES_BUCKETS);
  const bucketCount = Math.ceil(expectedTicks / bucketTicks);
  const slipSpeed_mps = options.slipSpeed_mps ?? DEFAULT_SLIP_SPEED_mps;
  let threshold_N = loadedThreshold_N(scenario.plant.robot);
  // The scorer's slip law per tick (score/slip.ts; stepPass.ts applies the same per step): loaded
  // feet, distance and the slip-speed test.
  let slip = new SlipTracker(n, threshold_N, slipSpeed_mps);

  const use = Array.from({ length: n }, () => new MinMaxBuckets(bucketCount));
  const normal = Array.from({ length: n }, () => new MinMaxBuckets(bucketCount));
  const stanceTicks = new Uint32Array(n * bucketCount);
  const slipping = new Uint8Array(n * bucketCount);
  const slipDistance = new Float64Array(n * bucketCount);
  const bucketTicksSeen = new Uint32Array(bucketCount);
  const t = new Float64Array(bucketCount);
  const trunk = new Float64Array(4 * bucketCount);
  const wasLoaded = new Uint8Array(n);
  const slipStart = new Float64Array(3 * n); // t, x, y
  const slipFrom = new Float64Array(n);
  const inSlip = new Uint8Array(n);
  const loopBins = new Uint32Array(LOOP_BIN_COUNT);
  const footholds: Foothold[] = [];
  const slips: SlipSegment[] = [];
  const dropped = { footholds: 0, slips: 0 };
  let governorPairs: { axis: string; target: number; applied: number; targetBuckets: MinMaxBuckets; appliedBuckets: MinMaxBuckets }[] = [];
  // Every telemetry scalar: per-bucket extremes for the plots, exact run extremes for results.json.
  let telemetryNames: readonly string[] = [];
  let telemetryBuckets: MinMaxBuckets[] = [];
  let telemetryMin = new Float64Array(0);
  let telemetryMax = new Float64Array(0);
  let allTelemetryNames: readonly string[] = [];
  let tick = 0;
  let loopTicks = 0;
  let lastTime_s = 0;
  let lastBucket = -1;
  const lastFoot = new Float64Array(2 * n);

  const closeSlip = (i: number, end_s: number): void => {
    inSlip[i] = 0;
    if (slips.length >= MAX_SLIP_SEGMENTS) {
      dropped.slips++;
      return;
    }
    slips.push({
      foot: i,
      start_s: round(slipStart[3 * i], DIGITS + 1),
      end_s: round(end_s, DIGITS + 1),
      from_m: [round(slipStart[3 * i + 1], DIGITS), round(slipStart[3 * i + 2], DIGITS)],
      to_m: [round(lastFoot[2 * i], DIGITS), round(lastFoot[2 * i + 1], DIGITS)],
      distance_m: round(slip.distancePerFoot_m[i] - slipFrom[i], DIGITS),
    });
  };

  const range = (k: number) => ({
    min: Number.isFinite(telemetryMin[k]) ? telemetryMin[k] : null,
    max: Number.isFinite(telemetryMax[k]) ? telemetryMax[k] : null,
  });

  return {
    telemetryRanges: () => allTelemetryNames.map((name, k) => ({ name, ...range(k) })),
    onStart(info: EpisodeStart): void {
      threshold_N = info.loadedThreshold_N;
      slip = new SlipTracker(n, threshold_N, slipSpeed_mps);
      governorPairs = [];
      const names = info.telemetryNames;
      allTelemetryNames = names;
      telemetryNames = names.slice(0, MAX_TELEMETRY_SERIES);
      telemetryBuckets = telemetryNames.map(() => new MinMaxBuckets(bucketCount));
      telemetryMin = new Float64Array(names.length).fill(Number.POSITIVE_INFINITY);
      telemetryMax = new Float64Array(names.length).fill(Number.NEGATIVE_INFINITY);
      names.forEach((name, index) => {
        if (!name.startsWith('governor.target.')) return;
        const axis = name.slice('governor.target.'.length);
        const applied = names.indexOf(`governor.applied.${axis}`);
        if (applied < 0) return;
        governorPairs.push({ axis, target: index, applied, targetBuckets: new MinMaxBuckets(bucketCount), appliedBuckets: new MinMaxBuckets(bucketCount) });
      });
    },
    onTick(s: TickSample, action: Action): void {
      const b = Math.min(bucketCount - 1, Math.floor(tick / bucketTicks));
      tick++;
      lastBucket = b;
      lastTime_s = s.time_s;
      t[b] = s.time_s;
      bucketTicksSeen[b]++;
      trunk[4 * b] = s.trunkPosition_m[0];
      trunk[4 * b + 1] = s.trunkPosition_m[1];
      trunk[4 * b + 2] = s.referencePosition_m[0];
      trunk[4 * b + 3] = s.referencePosition_m[1];
      const f = s.footForce_N;
      const p = s.footPosition_m;
      slip.record(s);
      for (let i = 0; i < n; i++) {
        const fz = f[3 * i + 2];
        const loaded = slip.loaded[i] === 1;
        const x = p[3 * i];
        const y = p[3 * i + 1];
        lastFoot[2 * i] = x;
        lastFoot[2 * i + 1] = y;
        normal[i].add(b, fz);
        if (s.mode[i] === STANCE) stanceTicks[i * bucketCount + b]++;
        const slidingNow = slip.sliding[i] === 1;
        if (loaded) {
          use[i].add(b, 1 - frictionMargin(f[3 * i], f[3 * i + 1], fz, s.footStaticFriction[i]));
          if (!wasLoaded[i]) {
            if (footholds.length < MAX_FOOTHOLDS) footholds.push({ foot: i, t_s: round(s.time_s, DIGITS + 1), x_m: round(x, DIGITS), y_m: round(y, DIGITS) });
            else dropped.footholds++;
          }
        }
        wasLoaded[i] = loaded ? 1 : 0;
        if (slidingNow) {
          slipping[i * bucketCount + b] = 1;
          if (!inSlip[i]) {
            inSlip[i] = 1;
            slipStart[3 * i] = s.time_s;
            slipStart[3 * i + 1] = x;
            slipStart[3 * i + 2] = y;
            slipFrom[i] = slip.distancePerFoot_m[i];
          }
        } else if (inSlip[i]) {
          closeSlip(i, s.time_s);
        }
        slipDistance[i * bucketCount + b] = slip.distancePerFoot_m[i];
      }
      for (let k = 0; k < governorPairs.length; k++) {
        const g = governorPairs[k];
        g.targetBuckets.add(b, action.telemetry[g.target]);
        g.appliedBuckets.add(b, action.telemetry[g.applied]);
      }
      const telemetry = action.telemetry;
      for (let k = 0; k < telemetryBuckets.length; k++) telemetryBuckets[k].add(b, telemetry[k]);
      for (let k = 0; k < allTelemetryNames.length; k++) {
        const value = telemetry[k];
        if (value < telemetryMin[k]) telemetryMin[k] = value;
        if (value > telemetryMax[k]) telemetryMax[k] = value;
      }
      const loop_us = s.loopTime_us;
      if (Number.isFinite(loop_us) && loop_us >= 0) {
        const k = loop_us <= LOOP_BIN_START_us ? 0 : Math.floor(Math.log(loop_us / LOOP_BIN_START_us) / Math.log(LOOP_BIN_RATIO));
        loopBins[Math.min(LOOP_BIN_COUNT - 1, k)]++;
        loopTicks++;
      }
    },
    finish(): RunSeries {
      for (let i = 0; i < n; i++) if (inSlip[i]) closeSlip(i, lastTime_s);
      const used = lastBucket + 1;
      const pick = (array: Float64Array, stride: number, offset: number, digits: number) =>
        Array.from({ length: used }, (_, k) => round(array[stride * k + offset], digits));
      const bins: [number, number][] = [];
      loopBins.forEach((count, k) => {
        if (count > 0) bins.push([k, count]);
      });
      return {
        format: SERIES_FORMAT,
        formatVersion: SERIES_FORMAT_VERSION,
        scenario: { id: scenario.id, hash: scenario.hash },
        build,
        footCount: n,
        loadedThreshold_N: round(threshold_N, 8),
        slipSpeed_mps,
        controlPeriod_s: 1 / rate_Hz,
        bucketTicks,
        t_s: pick(t, 1, 0, DIGITS + 2),
        feet: Array.from({ length: n }, (_, i) => ({
          frictionUse: use[i].toSeries(used, 4),
          normalForce_N: normal[i].toSeries(used, 4),
          stance: Array.from({ length: used }, (_, k) => round(stanceTicks[i * bucketCount + k] / Math.max(1, bucketTicksSeen[k]), 3)),
          slipping: Array.from({ length: used }, (_, k) => (slipping[i * bucketCount + k] ? 1 : 0) as 0 | 1),
          slipDistance_m: Array.from({ length: used }, (_, k) => round(slipDistance[i * bucketCount + k], 4)),
        })),
        trunk: { x_m: pick(trunk, 4, 0, DIGITS), y_m: pick(trunk, 4, 1, DIGITS), referenceX_m: pick(trunk, 4, 2, DIGITS), referenceY_m: pick(trunk, 4, 3, DIGITS) },
        footholds,
        slips,
        dropped: { ...dropped, telemetry: allTelemetryNames.length - telemetryNames.length },
        telemetry: telemetryNames.map((name, k): TelemetrySeries => ({ name, values: telemetrySeries(telemetryBuckets[k], used), ...range(k) })),
        governor: governorPairs.map((g) => ({ axis: g.axis, target: g.targetBuckets.toSeries(used, 4), applied: g.appliedBuckets.toSeries(used, 4) })),
        loopTime: { start_us: LOOP_BIN_START_us, ratio: LOOP_BIN_RATIO, bins, ticks: loopTicks, budget_us: scenario.control.loopBudget_us },
        friction: compactFrictionMap(scenario.plant.ground.friction),
        events: scenarioEvents(scenario).slice(0, MAX_SERIES_EVENTS),
        ...(scenario.plant.robot.legNames ? { legNames: [...scenario.plant.robot.legNames] } : {}),
      };
    },
  };
}

/** A telemetry scalar's buckets for the plots: 6 significant digits, clipped to the series bound. */
function telemetrySeries(buckets: MinMaxBuckets, used: number): { min: (number | null)[]; max: (number | null)[] } {
  const raw = buckets.toSeries(used, 6);
  const clip = (v: number | null) => (v === null ? null : Math.max(-TELEMETRY_PLOT_LIMIT, Math.min(TELEMETRY_PLOT_LIMIT, v)));
  return { min: raw.min.map(clip), max: raw.max.map(clip) };
}
