// Data prep: a results set (plus its series files, the gate's outcome and bench figures) becomes
// the plain view model the templates lay out. Every user string stays a plain string here (the
// templates escape it); every plot is SvgMarkup built from numbers by plot/ (timeSeries.ts, floor.ts, overview.ts).

import { existsSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { defaultPolicy, type GatePolicy } from '../gate/defaults.js';
import { gateWithinResults } from '../gate/gate.js';
import { formatGateValue } from '../gate/render.js';
import { GateInputError, type GateOutcome } from '../gate/types.js';
import type { BuildManifest, ResultsFile, RunResult, RunStatus } from '../results/types.js';
import { benchView, type BenchView } from './bench.js';
import { familiesView, marginView, type FamilyView, type MarginView } from './margin.js';
import { metricCells, type MetricCell } from './matrix.js';
import { floorDefinition, floorExtent, floorPlot, muLegend } from './plot/floor.js';
import { buildSwatch, marginAxis, marginDots, slipAxis, slipDots } from './plot/overview.js';
import { frictionUsePlot, governorAxisFlat, governorPlot, loopTimePlot, normalForcePlot, slipDistancePlot, telemetryPlot, timeClipDefinition, type TimeEvent } from './plot/timeSeries.js';
import { rollUp, regressionGroups, type RegressionGroup, type RollUpRow } from './rollup.js';
import { telemetryOf } from './telemetry.js';
import { buildStyle, type BuildStyle } from './plot/palette.js';
import { niceCeil } from './plot/scale.js';
import { asSvg, label, type SvgMarkup } from './plot/svg.js';
import { readSeriesFor } from '../score/series/file.js';
import { recordedErrorPlot, recordedPathPlot } from './plot/fidelity.js';
import type { FidelityBlock } from '../score/fidelity.js';
import { describeDivergence, firstDivergence } from '../results/divergence.js';
import type { RunSeries } from '../score/series/types.js';
import type { ResolvedScenario } from '../scenario/types.js';
import { scenarioEvents } from '../scenario/events.js';

export interface ReportOptions {
  /** Folder the report is written to (links are relative to it). */
  outDir: string;
  /** The build the others are compared with; default: the gate's baseline, else the first build. */
  baseline?: string;
  /** The gate's outcome when the caller already ran it (its regressions are listed as they are). */
  gate?: GateOutcome;
  /** Policy for the within-results gate when no outcome is given (default: the built-in one). */
  policy?: GatePolicy;
  /** Bench figures (#7), any of the shapes bench.ts reads. */
  bench?: unknown;
  /** Results folders holding series/ and traces/ (default: [outDir]); merged shards name theirs. */
  sourceDirs?: string[];
  /** Series files (absolute paths) written by this process's runs: read without re-checking their content. */
  writtenSeries?: ReadonlySet<string>;
  /** For reproducible output in tests. */
  generatedAt?: Date;
  /**
   * The resolved scenarios of the run (matched to runs by id and hash): their pushes and command
   * changes are marked on the time axes and their robot's legNames label the feet. Optional: without
   * them the plots say "foot i" and mark falls only.
   */
  scenarios?: readonly ResolvedScenario[];
  /**
   * The scenarios' series and plots read and drawn ahead (prepareScenarioPlots), e.g. while the
   * gate's loop time was being timed in another thread; used when made for the same results,
   * baseline and folders, else drawn here.
   */
  preparedPlots?: PreparedPlots;
}

/** The gate-independent part of a scenario's view: everything but the gate's cells, counts and divergences. */
interface ScenarioPlots {
  view: ScenarioView;
  traces: { href: string; name: string }[];
}

/** Scenario plots drawn ahead of the gate (prepareScenarioPlots), with what they were drawn for. */
export interface PreparedPlots {
  readonly signature: string;
  readonly scenarios: ReadonlyMap<string, ScenarioPlots>;
}

const STATUS_GLYPH: Record<RunStatus, string> = { pass: '✓', fail: '✗', error: '!' };

export interface BuildView {
  name: string;
  index: number;
  style: BuildStyle;
  swatch: SvgMarkup;
  isBaseline: boolean;
  counts: Record<RunStatus, number>;
  total: number;
  bar: SvgMarkup;
  manifest: { kind: string; entry: string; commit: string; dirty: string; extra: string };
}

export interface RunView {
  build: string;
  buildIndex: number;
  swatch: SvgMarkup;
  status: RunStatus;
  glyph: string;
  reasons: string[];
  error: { message: string; reason: string; time: string; stderrTail: string } | null;
  hasSeries: boolean;
  seriesProblem: string | null;
  frictionUse: SvgMarkup | null;
  normalForce: SvgMarkup | null;
  floor: SvgMarkup | null;
  floorCaption: string;
  governor: { axis: string; svg: SvgMarkup }[];
  /** Named telemetry scalars by name prefix (when the series file carries them). */
  telemetry: { prefix: string; plots: { name: string; svg: SvgMarkup }[] }[];
  /** Governor axes not plotted because target and applied stayed constant. */
  governorFlat: string;
  loopTime: SvgMarkup | null;
  loopCaption: string;
  traceHref: string | null;
  cells: MetricCell[];
  isBaseline: boolean;
  /** footing replay: recorded vs simulated overlays (plot/fidelity.ts), with the figures. */
  fidelity: { path: SvgMarkup; error: SvgMarkup; caption: string; note: string } | null;
}

export interface ScenarioView {
  anchor: string;
  index: number;
  id: string;
  title: string;
  revision: number;
  hash: string;
  hashShort: string;
  file: string;
  open: boolean;
  regressionCount: number;
  runs: RunView[];
  /** Runs with their matrix cells, in build order; null where the build did not run it. */
  row: (RunView | null)[];
  floorDefinition: SvgMarkup | null;
  muLegend: SvgMarkup | null;
  materials: { name: string; mu: string; kind: string }[];
  slipOverlay: SvgMarkup | null;
  overview: { margin: SvgMarkup; slip: SvgMarkup };
  hasGovernor: boolean;
  hasTelemetry: boolean;
  duration: string;
  /** Longest run, in ms (the zoom's range). */
  tMax_ms: number;
  /** "governed → overtrusting: first differs at …" per gated build pair with traces. */
  divergences: string[];
}

export interface RegressionView {
  anchor: string;
  scenario: string;
  title: string;
  builds: string;
  metric: string;
  baseline: string;
  candidate: string;
  change: string;
  rule: string;
  reason: string;
}

export interface ReportModel {
  title: string;
  generatedAt: string;
  results: { toolVersion: string; startedAt: string; machine: string };
  baseline: { name: string; explicit: boolean } | null;
  builds: BuildView[];
  totals: Record<RunStatus, number> & { runs: number };
  /** One row per compared build (null without a gate). */
  rollUp: (RollUpRow & { swatch: SvgMarkup; buildIndex: number })[] | null;
  /** The build with the most new failures (ties: the first in pair order); null when none. */
  mostNewFailures: string | null;
  gate: {
    groups: RegressionGroup[];
    present: boolean;
    verdict: string;
    headline: string;
    against: string;
    regressions: RegressionView[];
    notComparable: string[];
    unpaired: string[];
    warnings: string[];
    problem: string | null;
    moved: number;
  };
  scenarios: ScenarioView[];
  overviewAxes: { margin: SvgMarkup; slip: SvgMarkup };
  timeClip: SvgMarkup;
  bench: BenchView;
  /** Present only when some run carries a margin search (`footing margin`). */
  margin: MarginView | null;
  /** Present only when the results hold family scores. */
  families: FamilyView[] | null;
  provenance: { scenarios: { id: string; title: string; revision: number; hash: string; file: string; anchor: string }[]; traces: { href: string; name: string }[] };
  legend: { better: string; worse: string; same: string };
}

export function buildReportModel(results: ResultsFile, options: ReportOptions): ReportModel {
  const sourceDirs = sourceDirsOf(options);
  const buildNames = orderedBuilds(results);
  const explicitBaseline = options.baseline ?? options.gate?.buildPairs[0]?.[0];
  const baselineName = baselineOf(buildNames, explicitBaseline);

  // The gate: the caller's outcome, else the same within-results gate `footing run --baseline` runs.
  let gate: GateOutcome | null = options.gate ?? null;
  let gateProblem: string | null = null;
  if (!gate && baselineName !== null) {
    try {
      gate = gateWithinResults(results, baselineName, options.policy ?? defaultPolicy());
    } catch (error) {
      if (!(error instanceof GateInputError)) throw error;
      gateProblem = error.message;
    }
  }

  const manifests = new Map<string, BuildManifest>(results.builds.map((b) => [b.name, b]));
  const builds: BuildView[] = buildNames.map((name, index) => {
    const runs = results.runs.filter((r) => r.build === name);
    const counts = { pass: 0, fail: 0, error: 0 };
    for (const r of runs) counts[r.status]++;
    const style = buildStyle(name, name === baselineName);
    return {
      name,
      index,
      style,
      swatch: buildSwatch(style),
      isBaseline: name === baselineName,
      counts,
      total: runs.length,
      bar: statusBar(counts),
      manifest: describeManifest(manifests.get(name)),
    };
  });
  const buildIndex = new Map(buildNames.map((n, i) => [n, i]));

  const groups = scenarioGroups(results);
  const anchors = new Map<string, string>();
  const anchorByKey = new Map<string, string>();
  const scenarios: ScenarioView[] = [];
  const traces: { href: string; name: string }[] = [];
  const prepared = options.preparedPlots?.signature === plotSignature(groups, buildNames, baselineName, sourceDirs, options) ? options.preparedPlots.scenarios : null;
  let index = 0;
  for (const [key, runs] of groups) {
    const ref = runs[0].scenario;
    const anchor = scenarioAnchor(index, ref.id);
    if (!anchors.has(ref.id)) anchors.set(ref.id, anchor);
    anchorByKey.set(key, anchor);
    const ctx: ScenarioContext = { buildNames, buildIndex, baselineName, gate, sourceDirs, writtenSeries: options.writtenSeries, outDir: options.outDir, traces, resolved: resolvedFor(options, ref) };
    scenarios.push(scenarioView(runs, prepared?.get(key) ?? scenarioPlots(runs, index, anchor, ctx), ctx));
    index++;
  }

  const totals = { pass: 0, fail: 0, error: 0, runs: results.runs.length };
  for (const r of results.runs) totals[r.status]++;

  const titles = new Map(results.runs.map((r) => [r.scenario.id, r.scenario.title]));
  const regressions: RegressionView[] = (gate?.rows ?? [])
    .filter((r) => r.broken)
    .map((r) => ({
      anchor: anchors.get(r.scenario) ?? '',
      scenario: r.scenario,
      title: titles.get(r.scenario) ?? '',
      builds: r.baselineBuild === r.candidateBuild ? r.baselineBuild : `${r.baselineBuild} → ${r.candidateBuild}`,
      metric: r.metric,
      baseline: formatGateValue(r.metric, r.baseline),
      candidate: formatGateValue(r.metric, r.candidate),
      change: r.change,
      rule: r.rule ?? '(info)',
      reason: r.reason ?? '',
    }));

  const anchorOfRun = (run: RunResult) => anchorByKey.get(`${run.scenario.id}\u0000${run.scenario.hash}`) ?? '';
  const rolled = gate ? rollUp(gate, results.runs, anchorOfRun) : null;
  let most: RollUpRow | null = null;
  for (const row of rolled ?? []) if (row.newFailures > 0 && (!most || row.newFailures > most.newFailures)) most = row;

  const machine = results.machine;
  return {
    rollUp: rolled?.map((r) => ({ ...r, swatch: buildSwatch(buildStyle(r.build, r.build === baselineName)), buildIndex: buildIndex.get(r.build) ?? 0 })) ?? null,
    mostNewFailures: most?.build ?? null,
    title: `Footing report — ${results.runs.length} runs, ${buildNames.length} build${buildNames.length === 1 ? '' : 's'}`,
    generatedAt: (options.generatedAt ?? new Date()).toISOString(),
    results: {
      toolVersion: results.toolVersion,
      startedAt: results.startedAt,
      machine: `${machine.cpuModel}, ${machine.cores} cores, ${machine.platform}/${machine.arch}, Node ${machine.nodeVersion}`,
    },
    baseline: baselineName === null ? null : { name: baselineName, explicit: explicitBaseline === baselineName },
    builds,
    totals,
    gate: {
      groups: regressionGroups(gate, titles, anchors),
      present: gate !== null,
      verdict: gate ? gate.verdict : 'none',
      headline: gate
        ? gate.verdict === 'block'
          ? `blocks: ${regressions.length} rule${regressions.length === 1 ? '' : 's'} broken in ${gate.compared} compared run${gate.compared === 1 ? '' : 's'}`
          : `holds: no rule broken in ${gate.compared} compared run${gate.compared === 1 ? '' : 's'}`
        : 'not applied',
      against: gate ? gate.buildPairs.map(([b, c]) => `${b} → ${c}`).join(', ') : '',
      regressions,
      notComparable: (gate?.notComparable ?? []).map((n) => `${n.scenario} (${n.baselineBuild} → ${n.candidateBuild}): ${n.reason}`),
      unpaired: (gate?.unpaired ?? []).map((u) => `${u.side} ${u.build}${u.scenario === null ? '' : ` ${u.scenario}`}: ${u.reason}`),
      warnings: gate?.warnings ?? [],
      problem: gateProblem ?? (baselineName === null ? 'one build only: nothing to compare' : null),
      moved: (gate?.rows ?? []).filter((r) => !r.broken).length,
    },
    scenarios,
    overviewAxes: { margin: marginAxis(), slip: slipAxis() },
    timeClip: timeClipDefinition(),
    bench: benchView(options.bench),
    margin: marginView(results, buildNames, anchorOfRun, baselineName),
    families: familiesView(results, buildNames, baselineName),
    provenance: {
      scenarios: scenarios.map((s) => ({ id: s.id, title: s.title, revision: s.revision, hash: s.hash, file: s.file, anchor: s.anchor })),
      traces,
    },
    legend: { better: '▲', worse: '▼', same: '=' },
  };
}

function sourceDirsOf(options: ReportOptions): string[] {
  return options.sourceDirs && options.sourceDirs.length > 0 ? options.sourceDirs : [options.outDir];
}

function baselineOf(buildNames: readonly string[], explicit: string | undefined): string | null {
  return explicit !== undefined && buildNames.includes(explicit) ? explicit : buildNames.length > 1 ? buildNames[0] : null;
}

/** Scenarios in the order of the runs (the suite's deterministic order), keyed by id and hash. */
function scenarioGroups(results: ResultsFile): Map<string, RunResult[]> {
  const groups = new Map<string, RunResult[]>();
  for (const run of results.runs) {
    const key = `${run.scenario.id}\u0000${run.scenario.hash}`;
    if (!groups.has(key)) groups.set(key, []);
    (groups.get(key) as RunResult[]).push(run);
  }
  return groups;
}

function scenarioAnchor(index: number, id: string): string {
  return `scenario-${index + 1}-${id.replace(/[^A-Za-z0-9_-]/g, '-')}`;
}

function resolvedFor(options: ReportOptions, ref: RunResult['scenario']): ResolvedScenario | null {
  return options.scenarios?.find((s) => s.id === ref.id && s.hash === ref.hash) ?? null;
}

/** What the plots depend on besides the series files: the runs in order, the builds, the baseline, the folders. */
function plotSignature(groups: Map<string, RunResult[]>, buildNames: readonly string[], baselineName: string | null, sourceDirs: readonly string[], options: ReportOptions): string {
  const runs = [...groups.values()].map((rs) => rs.map((r) => [r.scenario.id, r.scenario.hash, r.build, r.status, r.trace ?? null]));
  return JSON.stringify([runs, buildNames, baselineName, sourceDirs, options.outDir, options.scenarios?.length ?? 0]);
}

/**
 * Reads the series and draws every scenario's plots (the bulk of a report's cost) without the
 * gate, for buildReportModel to use later (ReportOptions.preparedPlots): the caller can do this
 * while the gate's inputs are still being measured. `options.baseline` must name the baseline
 * the report will have (the gate's otherwise), or the plots are drawn again.
 */
export function prepareScenarioPlots(results: ResultsFile, options: Omit<ReportOptions, 'gate' | 'preparedPlots'>): PreparedPlots {
  const sourceDirs = sourceDirsOf(options);
  const buildNames = orderedBuilds(results);
  const baselineName = baselineOf(buildNames, options.baseline);
  const buildIndex = new Map(buildNames.map((n, i) => [n, i]));
  const groups = scenarioGroups(results);
  const scenarios = new Map<string, ScenarioPlots>();
  let index = 0;
  for (const [key, runs] of groups) {
    const ref = runs[0].scenario;
    const ctx: ScenarioContext = { buildNames, buildIndex, baselineName, gate: null, sourceDirs, writtenSeries: options.writtenSeries, outDir: options.outDir, traces: [], resolved: resolvedFor(options, ref) };
    scenarios.set(key, scenarioPlots(runs, index, scenarioAnchor(index, ref.id), ctx));
    index++;
  }
  return { signature: plotSignature(groups, buildNames, baselineName, sourceDirs, options), scenarios };
}

interface ScenarioContext {
  buildNames: string[];
  buildIndex: Map<string, number>;
  baselineName: string | null;
  gate: GateOutcome | null;
  sourceDirs: string[];
  writtenSeries: ReadonlySet<string> | undefined;
  outDir: string;
  traces: { href: string; name: string }[];
  resolved: ResolvedScenario | null;
}

/** First divergence of each gated build pair's traces on this scenario (recorded/divergence.ts). */
function scenarioDivergences(runs: RunResult[], ctx: ScenarioContext): string[] {
  if (!ctx.gate) return [];
  const traceText = (run: RunResult | undefined): string | null => {
    if (!run?.trace) return null;
    for (const dir of ctx.sourceDirs) {
      const file = path.join(dir, run.trace);
      if (existsSync(file)) return readFileSync(file, 'utf8');
    }
    return null;
  };
  const lines: string[] = [];
  for (const [base, cand] of ctx.gate.buildPairs) {
    const a = runs.find((r) => r.build === base);
    const b = runs.find((r) => r.build === cand);
    if (!a || !b) continue;
    const ta = traceText(a);
    const tb = traceText(b);
    if (ta === null || tb === null) continue;
    try {
      lines.push(`${base} → ${cand}: ${describeDivergence({ scenario: a.scenario.id, baselineBuild: base, candidateBuild: cand, divergence: firstDivergence(ta, tb) })}`);
    } catch (e) {
      lines.push(`${base} → ${cand}: not computed (${(e as Error).message})`);
    }
  }
  return lines;
}

/** A scenario's view from its plots and the gate: the gate's cells per run, its regression count, the traces' divergences. */
function scenarioView(runs: RunResult[], plots: ScenarioPlots, ctx: ScenarioContext): ScenarioView {
  const ref = runs[0].scenario;
  const baselineRun = runs.find((r) => r.build === ctx.baselineName) ?? null;
  for (const trace of plots.traces) ctx.traces.push(trace);
  const regressionCount = ctx.gate?.rows.filter((r) => r.broken && r.scenario === ref.id).length ?? 0;
  const views = plots.view.runs.map((view, k) => ({ ...view, cells: metricCells(runs[k], baselineRun, ctx.gate) }));
  const byBuild = new Map(views.map((v) => [v.build, v]));
  return {
    ...plots.view,
    open: regressionCount > 0,
    regressionCount,
    runs: views,
    row: ctx.buildNames.map((name) => byBuild.get(name) ?? null),
    divergences: scenarioDivergences(runs, ctx),
  };
}

/** Everything of a scenario's view that the gate does not decide: the series read, the plots drawn. */
function scenarioPlots(runs: RunResult[], index: number, anchor: string, ctx: ScenarioContext): ScenarioPlots {
  const ref = runs[0].scenario;
  const traces: { href: string; name: string }[] = [];
  const legNames = ctx.resolved?.plant.robot.legNames;
  const fixed = ctx.resolved ? scenarioEvents(ctx.resolved) : [];
  const loaded = runs.map((run) => {
    const lookup = readSeriesFor(ctx.sourceDirs, ref.id, ref.hash, run.build, ctx.writtenSeries);
    // The robot's leg names travel with the series the plots read (footLabel in plot/timeSeries.ts).
    if (lookup.series && legNames && legNames.length === lookup.series.footCount) lookup.series = { ...lookup.series, legNames } as RunSeries;
    return { run, lookup };
  });
  const withSeries = loaded.filter((l) => l.lookup.series !== null).map((l) => ({ run: l.run, series: l.lookup.series as RunSeries }));
  const tMax_s = Math.max(0.001, ...withSeries.map(({ series }) => series.t_s[series.t_s.length - 1] ?? 0));
  let forceMax = 0;
  for (const { series } of withSeries) for (const foot of series.feet) for (const v of foot.normalForce_N.max) if (v !== null) forceMax = Math.max(forceMax, v);
  const forceMax_N = niceCeil(Math.max(forceMax, 1), 4);
  const extent = floorExtent(withSeries.map((w) => w.series));
  const definitionId = `floor-${index + 1}`;
  const friction = withSeries[0]?.series.friction ?? null;

  const views: RunView[] = loaded.map(({ run, lookup }) => {
    const b = ctx.buildIndex.get(run.build) ?? 0;
    const series = lookup.series;
    let floor: ReturnType<typeof floorPlot> | null = null;
    if (series) floor = floorPlot(series, extent, definitionId, `${definitionId}-clip-${b}`, run.metrics?.fell ?? false);
    const traceHref = traceLink(run, ctx);
    if (traceHref) traces.push({ href: traceHref, name: `${ref.id} × ${run.build}` });
    const overBudget = series ? loopOver(series) : 0;
    // The series file carries the scenario's events too (a re-render has no scenario): once each.
    const events = series ? sharedEvents([fixed, runEvents(run, series)]) : [];
    return {
      build: run.build,
      buildIndex: b,
      swatch: buildSwatch(buildStyle(run.build, run.build === ctx.baselineName)),
      status: run.status,
      glyph: STATUS_GLYPH[run.status],
      reasons: run.reasons,
      error: run.error
        ? { message: run.error.message, reason: run.error.reason ?? '', time: run.error.time_s !== undefined ? `${label(run.error.time_s, 3)} s` : '', stderrTail: run.error.stderrTail ?? '' }
        : null,
      hasSeries: series !== null,
      seriesProblem: lookup.series === null ? (run.metrics === null ? 'the run ended before its first tick' : lookup.problem) : null,
      frictionUse: series ? frictionUsePlot(series, tMax_s, events) : null,
      normalForce: series ? normalForcePlot(series, tMax_s, forceMax_N, events) : null,
      floor: floor?.svg ?? null,
      floorCaption: floor
        ? `${series?.footholds.length ?? 0} footholds${series && series.dropped.footholds > 0 ? ` (+${series.dropped.footholds} not stored)` : ''}, ` +
          `${floor.slipsTotal} slip segment${floor.slipsTotal === 1 ? '' : 's'}${floor.slipsTotal > floor.slipsDrawn ? ` (${floor.slipsDrawn} longest drawn)` : ''}` +
          (floor.longest ? `; longest ${label(floor.longest.distance_m * 1000, 1)} mm (foot ${floor.longest.foot}, ${label(floor.longest.start_s, 2)} s, ringed)` : '')
        : '',
      governor: series ? series.governor.flatMap((g, k) => (governorAxisFlat(series, k) ? [] : [{ axis: g.axis, svg: governorPlot(series, k, tMax_s, events) }])) : [],
      telemetry: series ? telemetryOf(series).map((g) => ({ prefix: g.prefix, plots: g.scalars.map((t) => ({ name: t.name, svg: telemetryPlot(series, t.name, t.values, tMax_s, events) })) })) : [],
      governorFlat: series ? series.governor.filter((_, k) => governorAxisFlat(series, k)).map((g) => g.axis).join(', ') : '',
      loopTime: series && series.loopTime.ticks > 0 ? loopTimePlot(series) : null,
      loopCaption: series ? `${series.loopTime.ticks} ticks, ${overBudget} over the ${label(series.loopTime.budget_us, 0)} µs budget` : '',
      traceHref,
      cells: [],
      isBaseline: run.build === ctx.baselineName,
      fidelity: run.fidelity ? fidelityView(run.fidelity, buildStyle(run.build, run.build === ctx.baselineName)) : null,
    };
  });
  const byBuild = new Map(views.map((v) => [v.build, v]));
  const styled = withSeries.map(({ run, series }) => ({ series, build: run.build, style: buildStyle(run.build, run.build === ctx.baselineName) }));
  // One lane per build of the suite (in build order), so every scenario row lines builds up alike.
  const dots = (value: (r: RunResult) => number | null) =>
    ctx.buildNames.map((name) => {
      const r = runs.find((run) => run.build === name);
      return { value: r?.metrics ? value(r) : null, style: buildStyle(name, name === ctx.baselineName), passed: r?.status === 'pass' };
    });
  const view: ScenarioView = {
    anchor,
    index,
    id: ref.id,
    title: ref.title,
    revision: ref.revision,
    hash: ref.hash,
    hashShort: ref.hash.slice(0, 12),
    file: ref.file,
    open: false,
    regressionCount: 0,
    runs: views,
    row: ctx.buildNames.map((name) => byBuild.get(name) ?? null),
    floorDefinition: friction ? floorDefinition(friction, definitionId) : null,
    muLegend: friction ? muLegend(materialMus(friction)) : null,
    materials: friction ? describeMaterials(friction) : [],
    slipOverlay: styled.length > 0 ? slipDistancePlot(styled, tMax_s, sharedEvents([fixed, ...loaded.map((l) => (l.lookup.series ? runEvents(l.run, l.lookup.series) : []))])) : null,
    overview: { margin: marginDots(dots((r) => r.metrics?.frictionMargin.min ?? null)), slip: slipDots(dots((r) => r.metrics?.slipDistance_m ?? null)) },
    hasGovernor: views.some((v) => v.governor.length > 0 || v.governorFlat !== ''),
    hasTelemetry: views.some((v) => v.telemetry.length > 0),
    tMax_ms: Math.round(tMax_s * 1000),
    duration: `${label(tMax_s, 2)} s`,
    divergences: [],
  };
  return { view, traces };
}

/**
 * Time-axis events of one run: its fall (from the scorer's fellAt_s), and pushes and command changes
 * when the series file carries them (an optional `events` list of { t_s, kind, text }).
 */
function runEvents(run: RunResult, series: RunSeries): TimeEvent[] {
  const out: TimeEvent[] = [];
  const given = (series as RunSeries & { events?: unknown }).events;
  if (Array.isArray(given)) {
    for (const e of given as { t_s?: unknown; kind?: unknown; text?: unknown }[]) {
      if (typeof e?.t_s !== 'number' || !Number.isFinite(e.t_s) || (e.kind !== 'push' && e.kind !== 'command')) continue;
      out.push({ t_s: e.t_s, kind: e.kind, text: typeof e.text === 'string' ? e.text : e.kind });
    }
  }
  const m = run.metrics;
  if (m?.fell && typeof m.fellAt_s === 'number') out.push({ t_s: m.fellAt_s, kind: 'fall', text: `${run.build} fell` });
  return out;
}

/** Events every build shares (the scenario's pushes and commands) plus each build's fall. */
function sharedEvents(lists: TimeEvent[][]): TimeEvent[] {
  const seen = new Set<string>();
  const out: TimeEvent[] = [];
  for (const list of lists) for (const e of list) {
    const key = `${e.kind}\u0000${e.t_s}\u0000${e.text}`;
    if (seen.has(key)) continue;
    seen.add(key);
    out.push(e);
  }
  return out;
}

function loopOver(series: RunSeries): number {
  const lt = series.loopTime;
  let over = 0;
  for (const [k, count] of lt.bins) if (lt.start_us * lt.ratio ** k >= lt.budget_us) over += count;
  return over;
}

function traceLink(run: RunResult, ctx: ScenarioContext): string | null {
  if (!run.trace) return null;
  for (const dir of ctx.sourceDirs) {
    const file = path.join(dir, run.trace);
    if (!existsSync(file)) continue;
    const relative = path.relative(ctx.outDir, file).split(path.sep).map(encodeURIComponent).join('/');
    // Always a relative path (never a scheme), so the link stays a local file link.
    return relative.startsWith('.') ? relative : `./${relative}`;
  }
  return null;
}

function materialMus(map: RunSeries['friction']): number[] {
  const mus = new Set<number>([map.default.staticFriction, ...map.patches.map((p) => p.material.staticFriction)]);
  if (map.raster) for (const column of map.raster.staticFriction) for (const v of column) mus.add(v);
  return [...mus].sort((a, b) => a - b).slice(0, 24);
}

function describeMaterials(map: RunSeries['friction']): { name: string; mu: string; kind: string }[] {
  const out = [{ name: map.default.name, mu: label(map.default.staticFriction, 3), kind: 'floor' }];
  if (map.raster) {
    let lo = Infinity;
    let hi = -Infinity;
    for (const column of map.raster.staticFriction) for (const v of column) {
      lo = Math.min(lo, v);
      hi = Math.max(hi, v);
    }
    const nx = map.raster.staticFriction.length;
    const ny = nx > 0 ? map.raster.staticFriction[0].length : 0;
    out.push({ name: `raster ${nx} × ${ny} cells of ${label(map.raster.cell_m, 3)} m`, mu: lo === hi ? label(lo, 3) : `${label(lo, 3)}–${label(hi, 3)}`, kind: 'raster' });
  }
  for (const p of map.patches) out.push({ name: p.name, mu: label(p.material.staticFriction, 3), kind: p.shape.kind });
  return out;
}

function orderedBuilds(results: ResultsFile): string[] {
  const names = results.builds.map((b) => b.name).filter((n) => results.runs.some((r) => r.build === n));
  for (const r of results.runs) if (!names.includes(r.build)) names.push(r.build);
  return names;
}

function describeManifest(m: BuildManifest | undefined): BuildView['manifest'] {
  if (!m) return { kind: '', entry: '', commit: 'unknown', dirty: '', extra: '' };
  const { name: _name, kind, entry, commit, dirty, git: _git, ...rest } = m as BuildManifest & { git?: unknown };
  const extra = Object.entries(rest)
    .filter(([, v]) => v !== undefined && v !== null && !(Array.isArray(v) && v.length === 0) && !(typeof v === 'object' && !Array.isArray(v) && Object.keys(v as object).length === 0))
    .map(([k, v]) => `${k}: ${typeof v === 'string' ? v : JSON.stringify(v)}`)
    .join('; ');
  return {
    kind: kind ?? '',
    entry: entry ?? '',
    commit: typeof commit === 'string' ? commit : 'not in a git checkout',
    dirty: dirty === true ? 'uncommitted changes' : dirty === false ? 'clean' : '',
    extra,
  };
}

/** A proportional pass/fail/error bar (the counts are printed beside it, so colour is not needed). */
function statusBar(counts: Record<RunStatus, number>): SvgMarkup {
  const total = counts.pass + counts.fail + counts.error;
  const width = 160;
  let x = 0;
  let out = `<svg class="status-bar" viewBox="0 0 ${width} 12" width="${width}" height="12" aria-hidden="true">`;
  const fills: Record<RunStatus, string> = { pass: '#009E73', fail: '#D55E00', error: 'url(#hatch-error)' };
  for (const status of ['pass', 'fail', 'error'] as RunStatus[]) {
    if (total === 0 || counts[status] === 0) continue;
    const w = (counts[status] / total) * width;
    out += `<rect x="${x.toFixed(1)}" y="0" width="${w.toFixed(1)}" height="12" fill="${fills[status]}" stroke="#fff" stroke-width="1"/>`;
    x += w;
  }
  return asSvg(out + '</svg>');
}

/** The replay figures in one caption; the plots from plot/fidelity.ts. */
function fidelityView(f: FidelityBlock, style: ReturnType<typeof buildStyle>): NonNullable<RunView['fidelity']> {
  const e = f.trunkPositionError_m;
  const first = f.firstExceeded;
  const caption =
    `trunk path error RMS ${label(e.rms * 1000, 1)} mm, max ${label(e.max * 1000, 1)} mm at ${label(e.maxAt_s, 2)} s; ` +
    `first past tolerance: ${first ? `${label(first.time_s, 3)} s (${first.quantity})` : 'never'}; ` +
    `slips ${f.slips.recorded} recorded, ${f.slips.reproduced} reproduced, ${f.slips.extra} extra`;
  return { path: recordedPathPlot(f, style), error: recordedErrorPlot(f), caption, note: f.note };
}
