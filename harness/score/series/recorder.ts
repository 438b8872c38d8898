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
import { MinMaxBank, MinMaxBuckets, round, ticksPerBucket } from './buckets.js';
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
  return new BucketSeriesRecorder(scenario, build, options);
}

/**
 * A class, not an object of closures made per run: the episode loop's call to onTick then sees
 * one call target in every run, so its optimised code stays valid from run to run (as for the
 * scorer, score/scorer.ts; docs/bench.md, "The harness hot loop, second pass").
 */
class BucketSeriesRecorder implements SeriesRecorder {
  private readonly n: number;
  private readonly rate_Hz: number;
  private readonly bucketTicks: number;
  private readonly bucketCount: number;
  private readonly slipSpeed_mps: number;
  private threshold_N: number;
  // The scorer's slip law per tick (score/slip.ts; stepPass.ts applies the same per step): loaded
  // feet, distance and the slip-speed test.
  private slip: SlipTracker;
  private readonly use: MinMaxBuckets[];
  private readonly normal: MinMaxBuckets[];
  private readonly stanceTicks: Uint32Array;
  private readonly slipping: Uint8Array;
  private readonly slipDistance: Float64Array;
  private readonly bucketTicksSeen: Uint32Array;
  private readonly t: Float64Array;
  private readonly trunk: Float64Array;
  private readonly wasLoaded: Uint8Array;
  private readonly slipStart: Float64Array; // t, x, y per foot
  private readonly slipFrom: Float64Array;
  private readonly inSlip: Uint8Array;
  private readonly loopBins = new Uint32Array(LOOP_BIN_COUNT);
  /** Math.log(LOOP_BIN_RATIO), the same double, computed once instead of every tick. */
  private readonly logBinRatio = Math.log(LOOP_BIN_RATIO);
  private readonly footholds: Foothold[] = [];
  private readonly slips: SlipSegment[] = [];
  private readonly dropped = { footholds: 0, slips: 0 };
  private governorPairs: GovernorPair[] = [];
  // Every telemetry scalar: per-bucket extremes for the plots (the plotted scalars and the governor
  // pairs' channels, the first `telemetryBank.channels`), exact run extremes for results.json.
  private telemetryNames: readonly string[] = [];
  private telemetryBank = new MinMaxBank(0, 1);
  private telemetryMin = new Float64Array(0);
  private telemetryMax = new Float64Array(0);
  private allTelemetryNames: readonly string[] = [];
  private tick = 0;
  private loopTicks = 0;
  private lastTime_s = 0;
  private lastBucket = -1;
  private readonly lastFoot: Float64Array;

  constructor(
    private readonly scenario: ResolvedScenario,
    private readonly build: string,
    options: SeriesRecorderOptions,
  ) {
    const n = scenario.plant.robot.hips_m.length;
    this.n = n;
    this.rate_Hz = scenario.control.rate_Hz;
    const expectedTicks = Math.ceil(scenario.duration_s * this.rate_Hz) + 1;
    this.bucketTicks = ticksPerBucket(expectedTicks, options.maxBuckets ?? MAX_SERIES_BUCKETS);
    const bucketCount = Math.ceil(expectedTicks / this.bucketTicks);
    this.bucketCount = bucketCount;
    this.slipSpeed_mps = options.slipSpeed_mps ?? DEFAULT_SLIP_SPEED_mps;
    this.threshold_N = loadedThreshold_N(scenario.plant.robot);
    this.slip = new SlipTracker(n, this.threshold_N, this.slipSpeed_mps);
    this.use = Array.from({ length: n }, () => new MinMaxBuckets(bucketCount));
    this.normal = Array.from({ length: n }, () => new MinMaxBuckets(bucketCount));
    this.stanceTicks = new Uint32Array(n * bucketCount);
    this.slipping = new Uint8Array(n * bucketCount);
    this.slipDistance = new Float64Array(n * bucketCount);
    this.bucketTicksSeen = new Uint32Array(bucketCount);
    this.t = new Float64Array(bucketCount);
    this.trunk = new Float64Array(4 * bucketCount);
    this.wasLoaded = new Uint8Array(n);
    this.slipStart = new Float64Array(3 * n);
    this.slipFrom = new Float64Array(n);
    this.inSlip = new Uint8Array(n);
    this.lastFoot = new Float64Array(2 * n);
  }

  private closeSlip(i: number, end_s: number): void {
    this.inSlip[i] = 0;
    if (this.slips.length >= MAX_SLIP_SEGMENTS) {
      this.dropped.slips++;
      return;
    }
    const slipStart = this.slipStart, lastFoot = this.lastFoot;
    this.slips.push({
      foot: i,
      start_s: round(slipStart[3 * i], DIGITS + 1),
      end_s: round(end_s, DIGITS + 1),
      from_m: [round(slipStart[3 * i + 1], DIGITS), round(slipStart[3 * i + 2], DIGITS)],
      to_m: [round(lastFoot[2 * i], DIGITS), round(lastFoot[2 * i + 1], DIGITS)],
      distance_m: round(this.slip.distancePerFoot_m[i] - this.slipFrom[i], DIGITS),
    });
  }

  private range(k: number): { min: number | null; max: number | null } {
    return {
      min: Number.isFinite(this.telemetryMin[k]) ? this.telemetryMin[k] : null,
      max: Number.isFinite(this.telemetryMax[k]) ? this.telemetryMax[k] : null,
    };
  }

  telemetryRanges(): { name: string; min: number | null; max: number | null }[] {
    return this.allTelemetryNames.map((name, k) => ({ name, ...this.range(k) }));
  }

  onStart(info: EpisodeStart): void {
    const bucketCount = this.bucketCount;
    this.threshold_N = info.loadedThreshold_N;
    this.slip = new SlipTracker(this.n, this.threshold_N, this.slipSpeed_mps);
    const pairs: GovernorPair[] = [];
    const names = info.telemetryNames;
    this.allTelemetryNames = names;
    this.telemetryNames = names.slice(0, MAX_TELEMETRY_SERIES);
    this.telemetryMin = new Float64Array(names.length).fill(Number.POSITIVE_INFINITY);
    this.telemetryMax = new Float64Array(names.length).fill(Number.NEGATIVE_INFINITY);
    names.forEach((name, index) => {
      if (!name.startsWith('governor.target.')) return;
      const axis = name.slice('governor.target.'.length);
      const applied = names.indexOf(`governor.applied.${axis}`);
      if (applied < 0) return;
      pairs.push({ axis, target: index, applied });
    });
    this.governorPairs = pairs;
    // The governor pairs' buckets are their channels' buckets (the same values folded the same way).
    let channels = this.telemetryNames.length;
    for (const g of pairs) channels = Math.max(channels, g.target + 1, g.applied + 1);
    this.telemetryBank = new MinMaxBank(channels, bucketCount);
  }

  onTick(s: TickSample, action: Action): void {
    const n = this.n, bucketCount = this.bucketCount;
    const b = Math.min(bucketCount - 1, Math.floor(this.tick / this.bucketTicks));
    this.tick++;
    this.lastBucket = b;
    this.lastTime_s = s.time_s;
    this.t[b] = s.time_s;
    this.bucketTicksSeen[b]++;
    const trunk = this.trunk;
    trunk[4 * b] = s.trunkPosition_m[0];
    trunk[4 * b + 1] = s.trunkPosition_m[1];
    trunk[4 * b + 2] = s.referencePosition_m[0];
    trunk[4 * b + 3] = s.referencePosition_m[1];
    const f = s.footForce_N;
    const p = s.footPosition_m;
    const slip = this.slip;
    slip.record(s);
    const use = this.use, normal = this.normal, lastFoot = this.lastFoot, wasLoaded = this.wasLoaded;
    const inSlip = this.inSlip, slipStart = this.slipStart, slipping = this.slipping;
    for (let i = 0; i < n; i++) {
      const fz = f[3 * i + 2];
      const loaded = slip.loaded[i] === 1;
      const x = p[3 * i];
      const y = p[3 * i + 1];
      lastFoot[2 * i] = x;
      lastFoot[2 * i + 1] = y;
      normal[i].add(b, fz);
      if (s.mode[i] === STANCE) this.stanceTicks[i * bucketCount + b]++;
      const slidingNow = slip.sliding[i] === 1;
      if (loaded) {
        use[i].add(b, 1 - frictionMargin(f[3 * i], f[3 * i + 1], fz, s.footStaticFriction[i]));
        if (!wasLoaded[i]) {
          if (this.footholds.length < MAX_FOOTHOLDS) this.footholds.push({ foot: i, t_s: round(s.time_s, DIGITS + 1), x_m: round(x, DIGITS), y_m: round(y, DIGITS) });
          else this.dropped.footholds++;
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
          this.slipFrom[i] = slip.distancePerFoot_m[i];
        }
      } else if (inSlip[i]) {
        this.closeSlip(i, s.time_s);
      }
      this.slipDistance[i * bucketCount + b] = slip.distancePerFoot_m[i];
    }
    const telemetry = action.telemetry;
    this.telemetryBank.addAll(b, telemetry);
    const telemetryMin = this.telemetryMin, telemetryMax = this.telemetryMax;
    for (let k = 0; k < this.allTelemetryNames.length; k++) {
      const value = telemetry[k];
      if (value < telemetryMin[k]) telemetryMin[k] = value;
      if (value > telemetryMax[k]) telemetryMax[k] = value;
    }
    const loop_us = s.loopTime_us;
    if (Number.isFinite(loop_us) && loop_us >= 0) {
      const k = loop_us <= LOOP_BIN_START_us ? 0 : Math.floor(Math.log(loop_us / LOOP_BIN_START_us) / this.logBinRatio);
      this.loopBins[Math.min(LOOP_BIN_COUNT - 1, k)]++;
      this.loopTicks++;
    }
  }

  finish(): RunSeries {
    const n = this.n, bucketCount = this.bucketCount, scenario = this.scenario;
    for (let i = 0; i < n; i++) if (this.inSlip[i]) this.closeSlip(i, this.lastTime_s);
    const used = this.lastBucket + 1;
    const pick = (array: Float64Array, stride: number, offset: number, digits: number) =>
      Array.from({ length: used }, (_, k) => round(array[stride * k + offset], digits));
    const bins: [number, number][] = [];
    this.loopBins.forEach((count, k) => {
      if (count > 0) bins.push([k, count]);
    });
    const { stanceTicks, bucketTicksSeen, slipping, slipDistance, trunk } = this;
    return {
      format: SERIES_FORMAT,
      formatVersion: SERIES_FORMAT_VERSION,
      scenario: { id: scenario.id, hash: scenario.hash },
      build: this.build,
      footCount: n,
      loadedThreshold_N: round(this.threshold_N, 8),
      slipSpeed_mps: this.slipSpeed_mps,
      controlPeriod_s: 1 / this.rate_Hz,
      bucketTicks: this.bucketTicks,
      t_s: pick(this.t, 1, 0, DIGITS + 2),
      feet: Array.from({ length: n }, (_, i) => ({
        frictionUse: this.use[i].toSeries(used, 4),
        normalForce_N: this.normal[i].toSeries(used, 4),
        stance: Array.from({ length: used }, (_, k) => round(stanceTicks[i * bucketCount + k] / Math.max(1, bucketTicksSeen[k]), 3)),
        slipping: Array.from({ length: used }, (_, k) => (slipping[i * bucketCount + k] ? 1 : 0) as 0 | 1),
        slipDistance_m: Array.from({ length: used }, (_, k) => round(slipDistance[i * bucketCount + k], 4)),
      })),
      trunk: { x_m: pick(trunk, 4, 0, DIGITS), y_m: pick(trunk, 4, 1, DIGITS), referenceX_m: pick(trunk, 4, 2, DIGITS), referenceY_m: pick(trunk, 4, 3, DIGITS) },
      footholds: this.footholds,
      slips: this.slips,
      dropped: { ...this.dropped, telemetry: this.allTelemetryNames.length - this.telemetryNames.length },
      telemetry: this.telemetryNames.map((name, k): TelemetrySeries => ({ name, values: telemetrySeries(this.telemetryBank, k, used), ...this.range(k) })),
      governor: this.governorPairs.map((g) => ({ axis: g.axis, target: this.telemetryBank.toSeries(g.target, used, 4), applied: this.telemetryBank.toSeries(g.applied, used, 4) })),
      loopTime: { start_us: LOOP_BIN_START_us, ratio: LOOP_BIN_RATIO, bins, ticks: this.loopTicks, budget_us: scenario.control.loopBudget_us },
      friction: compactFrictionMap(scenario.plant.ground.friction),
      events: scenarioEvents(scenario).slice(0, MAX_SERIES_EVENTS),
      ...(scenario.plant.robot.legNames ? { legNames: [...scenario.plant.robot.legNames] } : {}),
    };
  }
}

interface GovernorPair {
  axis: string;
  target: number;
  applied: number;
}

/** A telemetry scalar's buckets for the plots: 6 significant digits, clipped to the series bound. */
function telemetrySeries(bank: MinMaxBank, channel: number, used: number): { min: (number | null)[]; max: (number | null)[] } {
  const raw = bank.toSeries(channel, used, 6);
  const clip = (v: number | null) => (v === null ? null : Math.max(-TELEMETRY_PLOT_LIMIT, Math.min(TELEMETRY_PLOT_LIMIT, v)));
  return { min: raw.min.map(clip), max: raw.max.map(clip) };
}
