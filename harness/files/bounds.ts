// Bounds checked before (or instead of) real work on a scenario file:
// - nesting, from the raw text before any parser sees it: the YAML parser and later walks recurse
//   per level, and a 20,000-deep `[[[[…` of 100 kB was enough to abort V8 itself;
// - list lengths, on the parsed data before the schema and checks walk it;
// - the run it describes: enough control ticks for the scorer to judge anything, and few enough
//   physics steps that its wall-clock allowance means something.

import type { Finding } from './issue.js';

/** Deeper nesting than any scenario needs; refusing it keeps every later walk bounded. */
export const MAX_NESTING_DEPTH = 64;

export const SCENARIO_LIMITS = {
  /** The text scan and the data walk (source.ts) refuse the same depth. */
  nestingDepth: MAX_NESTING_DEPTH,
  /**
   * Block nesting shows as indentation; 4 columns per level at the nesting limit. Counting
   * columns bounds the depth from above (each level needs at least one more column).
   */
  indentColumns: 4 * MAX_NESTING_DEPTH,
  /** Items in any one list (pushes, commands, patches, matrix values…): the bundled files use < 50. */
  listItems: 10_000,
  /**
   * Control ticks per run (duration_s × rate_Hz). Below this a run is too short to judge (a
   * loop-time percentile or a tracking error over a handful of ticks says nothing) and, at
   * zero, every build would pass without being asked anything. Common practice: 10 samples as
   * the least a percentile or mean is quoted from.
   */
  minTicksPerRun: 10,
  /**
   * Physics steps per run (duration_s ÷ step_s). An hour at the default 0.5 ms step is 7.2 M
   * steps; 20 M allows that hour at a step under 0.2 ms and keeps a run within its wall-clock
   * allowance on a slow machine (~2 µs per step measured in docs/bench.md order of magnitude).
   */
  maxPhysicsStepsPerRun: 20_000_000,
} as const;

/**
 * The first place the raw text nests deeper than the limits, or null. Counts flow brackets
 * (`[`, `{`) outside quoted strings and comments, and the indentation (with compact `- ` and
 * `? ` markers) of each line. Conservative: it may refuse an odd file the parser would accept
 * (e.g. a plain scalar holding 65 unmatched `[`), never the reverse.
 */
export function nestingProblemInText(text: string): Finding | null {
  let depth = 0;
  let line = 1;
  let lineStart = 0;
  let atLineStart = true;
  let indent = 0;
  let i = 0;
  const n = text.length;
  while (i < n) {
    const c = text.charCodeAt(i);
    if (c === 10 /* \n */) {
      line++;
      lineStart = i + 1;
      atLineStart = true;
      indent = 0;
      i++;
      continue;
    }
    if (atLineStart) {
      if (c === 32 || c === 9) {
        indent++;
        i++;
        continue;
      }
      // `- ` and `? ` at the start of a line open a level each ("- - - x" nests three deep).
      if ((c === 45 || c === 63) && (text.charCodeAt(i + 1) === 32 || text.charCodeAt(i + 1) === 10)) {
        indent += 2;
        i += 2;
        if (indent > SCENARIO_LIMITS.indentColumns) return indentFinding(line, i - lineStart);
        continue;
      }
      atLineStart = false;
      if (indent > SCENARIO_LIMITS.indentColumns) return indentFinding(line, i - lineStart + 1);
    }
    if (c === 35 /* # */ && (i === lineStart || isSpace(text.charCodeAt(i - 1)))) {
      while (i < n && text.charCodeAt(i) !== 10) i++;
      continue;
    }
    if (c === 34 /* " */ || (c === 39 /* ' */ && startsScalar(text, i, lineStart))) {
      const end = skipQuoted(text, i);
      for (let k = i; k < end; k++) {
        if (text.charCodeAt(k) === 10) {
          line++;
          lineStart = k + 1;
        }
      }
      i = end;
      continue;
    }
    if (c === 91 /* [ */ || c === 123 /* { */) {
      depth++;
      if (depth > SCENARIO_LIMITS.nestingDepth) {
        return {
          path: '',
          line,
          column: i - lineStart + 1,
          message: `nesting deeper than ${SCENARIO_LIMITS.nestingDepth} levels of [ and { is refused before parsing (limit: nesting depth ${SCENARIO_LIMITS.nestingDepth})`,
        };
      }
    } else if ((c === 93 /* ] */ || c === 125) /* } */ && depth > 0) {
      depth--;
    }
    i++;
  }
  return null;
}

function indentFinding(line: number, column: number): Finding {
  return {
    path: '',
    line,
    column,
    message: `this line nests more than ${SCENARIO_LIMITS.indentColumns} columns deep (limit: ${SCENARIO_LIMITS.indentColumns} columns, ${SCENARIO_LIMITS.nestingDepth} levels); refused before parsing`,
  };
}

function isSpace(c: number): boolean {
  return c === 32 || c === 9 || c === 13;
}

/** A single quote opens a YAML scalar only where a scalar can begin (not inside `don't`). */
function startsScalar(text: string, i: number, lineStart: number): boolean {
  let k = i - 1;
  while (k >= lineStart && isSpace(text.charCodeAt(k))) k--;
  if (k < lineStart) return true;
  const before = text.charCodeAt(k);
  return before === 91 || before === 123 || before === 44 /* , */ || before === 58 /* : */ || before === 45 /* - */ || before === 63 /* ? */;
}

/** Index just past the quoted scalar starting at i (or the end of text when it never closes). */
function skipQuoted(text: string, i: number): number {
  const quote = text.charCodeAt(i);
  let k = i + 1;
  while (k < text.length) {
    const c = text.charCodeAt(k);
    if (quote === 34 && c === 92 /* \ */) {
      k += 2;
      continue;
    }
    if (c === quote) {
      // '' is an escaped quote inside a single-quoted scalar.
      if (quote === 39 && text.charCodeAt(k + 1) === 39) {
        k += 2;
        continue;
      }
      return k + 1;
    }
    k++;
  }
  return k;
}

/** A list longer than the limit, found by the data walk (source.ts scanData). */
export function listLengthProblem(value: unknown[], pointer: string): Finding | null {
  if (value.length <= SCENARIO_LIMITS.listItems) return null;
  return { path: pointer, message: `a list of ${value.length} items is refused (limit: ${SCENARIO_LIMITS.listItems} items per list)` };
}

/** The run a scenario's timing describes: enough ticks, not too many physics steps. */
export function runSizeProblems(duration_s: number, rate_Hz: number, step_s: number, paths: { rate: string; step: string }): Finding[] {
  const problems: Finding[] = [];
  const ticks = duration_s * rate_Hz;
  if (ticks < SCENARIO_LIMITS.minTicksPerRun) {
    problems.push({
      path: '/duration_s',
      message: `duration_s ${duration_s} at ${rate_Hz} Hz gives ${Number(ticks.toPrecision(6))} control ticks, fewer than the ${SCENARIO_LIMITS.minTicksPerRun} a run needs to be judged (expected duration_s × rate_Hz ≥ ${SCENARIO_LIMITS.minTicksPerRun}; see ${paths.rate})`,
    });
  }
  const steps = duration_s / step_s;
  if (steps > SCENARIO_LIMITS.maxPhysicsStepsPerRun) {
    problems.push({
      path: paths.step,
      message: `step_s ${step_s} over duration_s ${duration_s} is ${Number(steps.toPrecision(6))} physics steps, more than the ${SCENARIO_LIMITS.maxPhysicsStepsPerRun} allowed per run (expected step_s ≥ ${Number((duration_s / SCENARIO_LIMITS.maxPhysicsStepsPerRun).toPrecision(6))} s for this duration)`,
    });
  }
  return problems;
}
