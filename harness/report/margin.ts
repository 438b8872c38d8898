// Data prep for the "Margin to failure" and "Families" sections (docs/margin.md, docs/report.md):
// the run `margin` searches of `footing margin` and the top-level `families` scores. Both views
// are null when the results carry no such data, so the page is unchanged for plain runs.

import type { FamilySummary, FrictionMarginRecord, MarginSearchRecord, PushMarginRecord } from '../results/margin.js';
import type { ResultsFile, RunResult } from '../results/types.js';
import { buildSwatch } from './plot/overview.js';
import { boundaryStrip, intervalBar, probeLegend, stripAxisMax } from './plot/margin.js';
import { buildStyle } from './plot/palette.js';
import { label, type SvgMarkup } from './plot/svg.js';

export interface SearchView {
  build: string;
  buildIndex: number;
  swatch: SvgMarkup;
  strip: SvgMarkup | null;
  /** "× 0.859 (μs 0.172)", "≤ × 0.05", "none: fails at every scale up to × 3", "not searched". */
  critical: string;
  /** The samples' count and the bracket, for the strip's caption. */
  caption: string;
  /** Set when the pass/fail boundary is not monotone: the samples that show it. */
  nonMonotone: string | null;
  notes: string[];
}

export interface MarginScenarioView {
  id: string;
  title: string;
  anchor: string;
  friction: SearchView[];
  push: SearchView[];
  /** One cell per build in build order (null where the build has no search), for the side-by-side table. */
  row: ({ build: string; buildIndex: number; friction: string; push: string; nonMonotone: boolean } | null)[];
}

export interface MarginView {
  scenarios: MarginScenarioView[];
  nonMonotoneCount: number;
  nonMonotoneNote: string | null;
  legend: { pass: SvgMarkup; fail: SvgMarkup; error: SvgMarkup };
}

export interface FamilyBuildView {
  build: string;
  buildIndex: number;
  swatch: SvgMarkup;
  bar: SvgMarkup;
  /** "17/20 (85 %)". */
  count: string;
  /** "95 % Wilson 64 – 95 %". */
  interval: string;
  errors: number;
  spreads: string[];
}

export interface FamilyView {
  id: string;
  file: string;
  samples: number;
  rows: FamilyBuildView[];
}

const scaleText = (v: number) => `× ${label(v, 3)}`;

function frictionCritical(f: FrictionMarginRecord | null): string {
  if (!f) return 'not searched';
  if (f.outcome === 'failsWholeRange') return `none: fails at every scale up to ${scaleText(f.range[1])}`;
  const mu = f.criticalStaticFriction === null ? '' : ` (μs ${label(f.criticalStaticFriction, 3)})`;
  if (f.outcome === 'passesWholeRange') return `≤ ${scaleText(f.criticalScale ?? f.range[0])}${mu}`;
  return `${scaleText(f.criticalScale as number)}${mu}`;
}

function pushCritical(p: PushMarginRecord | null): string {
  if (!p) return 'not searched';
  if (p.outcome === 'failsWholeRange') return 'none: fails even without the push';
  const n = p.criticalPeakForce_N === null ? '' : ` (${label(p.criticalPeakForce_N, 1)} N)`;
  if (p.outcome === 'passesWholeRange') return `≥ ${scaleText(p.criticalScale ?? p.range[1])}${n}`;
  return `${scaleText(p.criticalScale as number)}${n}`;
}

/** The samples on each side of a non-monotone boundary, in scale order: "pass × 0.3, fail × 0.35, pass × 0.4". */
function nonMonotoneText(s: MarginSearchRecord): string | null {
  if (s.monotone) return null;
  const sorted = [...s.samples].sort((a, b) => a.scale - b.scale);
  return `boundary not monotone — samples in scale order: ${sorted.map((p) => `${p.status} ${scaleText(p.scale)}`).join(', ')}`;
}

function searchView(run: RunResult, search: MarginSearchRecord | null, axisMax: number, buildIndex: number, baseline: string | null, what: 'friction' | 'push', critical: string): SearchView {
  const style = buildStyle(run.build, run.build === baseline);
  return {
    build: run.build,
    buildIndex,
    swatch: buildSwatch(style),
    strip: search ? boundaryStrip(search, axisMax, style, what) : null,
    critical,
    caption: search
      ? `${search.samples.length} probe${search.samples.length === 1 ? '' : 's'} in × ${label(search.range[0], 3)} … ${label(search.range[1], 3)}` +
        (search.bracket ? `; boundary between × ${label(search.bracket.failing, 3)} (fail) and × ${label(search.bracket.passing, 3)} (pass)` : '')
      : '',
    nonMonotone: search ? nonMonotoneText(search) : null,
    notes: search ? [] : (run.margin?.notes ?? []),
  };
}

export function marginView(results: ResultsFile, buildNames: readonly string[], anchorOf: (run: RunResult) => string, baseline: string | null = null): MarginView | null {
  const withMargin = results.runs.filter((r) => r.margin !== undefined);
  if (withMargin.length === 0) return null;
  const buildIndex = new Map(buildNames.map((n, i) => [n, i]));
  const groups = new Map<string, RunResult[]>();
  for (const run of withMargin) {
    const key = `${run.scenario.id}\u0000${run.scenario.hash}`;
    if (!groups.has(key)) groups.set(key, []);
    (groups.get(key) as RunResult[]).push(run);
  }
  let nonMonotoneCount = 0;
  const scenarios: MarginScenarioView[] = [];
  for (const runs of groups.values()) {
    runs.sort((a, b) => (buildIndex.get(a.build) ?? 0) - (buildIndex.get(b.build) ?? 0));
    const frictions = runs.map((r) => r.margin?.friction ?? null);
    const pushes = runs.map((r) => r.margin?.push ?? null);
    const frictionMax = stripAxisMax(frictions.filter((s): s is FrictionMarginRecord => s !== null));
    const pushMax = stripAxisMax(pushes.filter((s): s is PushMarginRecord => s !== null));
    const friction = runs.map((r, k) => searchView(r, frictions[k], frictionMax, buildIndex.get(r.build) ?? 0, baseline, 'friction', frictionCritical(frictions[k])));
    const push = pushes.some((p) => p !== null)
      ? runs.map((r, k) => searchView(r, pushes[k], pushMax, buildIndex.get(r.build) ?? 0, baseline, 'push', pushCritical(pushes[k])))
      : [];
    for (const s of [...frictions, ...pushes]) if (s && !s.monotone) nonMonotoneCount++;
    const ref = runs[0].scenario;
    scenarios.push({
      id: ref.id,
      title: ref.title,
      anchor: anchorOf(runs[0]),
      friction,
      push,
      row: buildNames.map((name) => {
        const k = runs.findIndex((r) => r.build === name);
        if (k < 0) return null;
        return {
          build: name,
          buildIndex: buildIndex.get(name) ?? 0,
          friction: frictionCritical(frictions[k]),
          push: pushCritical(pushes[k]),
          nonMonotone: frictions[k]?.monotone === false || pushes[k]?.monotone === false,
        };
      }),
    });
  }
  const nonMonotoneNote =
    nonMonotoneCount === 0
      ? null
      : `${nonMonotoneCount} search${nonMonotoneCount === 1 ? '' : 'es'} found a pass/fail boundary that is not monotone: one critical number does not describe ${nonMonotoneCount === 1 ? 'it' : 'them'}; see the samples listed below.`;
  return { scenarios, nonMonotoneCount, nonMonotoneNote, legend: { pass: probeLegend('pass'), fail: probeLegend('fail'), error: probeLegend('error') } };
}

function spreadText(name: string, s: FamilySummary['slipDistance_m'], digits: number, unit = '', factor = 1): string | null {
  if (!s) return null;
  const f = (v: number) => label(v * factor, digits);
  return `${name}: median ${f(s.median)}${unit} (p10 ${f(s.p10)} – p90 ${f(s.p90)}, min ${f(s.min)}, max ${f(s.max)})`;
}

export function familiesView(results: ResultsFile, buildNames: readonly string[], baseline: string | null = null): FamilyView[] | null {
  const families = results.families ?? [];
  if (families.length === 0) return null;
  const buildIndex = new Map(buildNames.map((n, i) => [n, i]));
  const byId = new Map<string, FamilySummary[]>();
  for (const f of families) {
    const key = `${f.id}\u0000${f.file}`;
    if (!byId.has(key)) byId.set(key, []);
    (byId.get(key) as FamilySummary[]).push(f);
  }
  return [...byId.values()].map((list) => {
    list.sort((a, b) => (buildIndex.get(a.build) ?? 0) - (buildIndex.get(b.build) ?? 0));
    return {
      id: list[0].id,
      file: list[0].file,
      samples: list[0].samples,
      rows: list.map((f) => {
        const b = buildIndex.get(f.build) ?? 0;
        const style = buildStyle(f.build, f.build === baseline);
        const pct = (v: number) => label(v * 100, 0);
        return {
          build: f.build,
          buildIndex: b,
          swatch: buildSwatch(style),
          bar: intervalBar(f.successRate, f.interval.lower, f.interval.upper, style),
          count: `${f.successes}/${f.runs} (${pct(f.successRate)} %)`,
          interval: `${label(f.interval.confidence * 100, 1)} % Wilson ${pct(f.interval.lower)} – ${pct(f.interval.upper)} %`,
          errors: f.errors,
          spreads: [
            spreadText('friction margin min', f.frictionMarginMin, 3),
            spreadText('slip distance', f.slipDistance_m, 1, ' mm', 1000),
            spreadText('critical friction scale', f.criticalFrictionScale ?? null, 3),
          ].filter((s): s is string => s !== null),
        };
      }),
    };
  });
}
