// Which scenarios a command runs: `--tag T` (repeatable; a scenario must carry every one),
// `--exclude-tag T` (a scenario carrying any is left out) and `--grep PATTERN` (a JavaScript
// regular expression searched in the scenario id). A suite of footing.config.yaml may name tags.

export interface ScenarioSelection {
  tags?: readonly string[];
  excludeTags?: readonly string[];
  grep?: string;
}

export class SelectionError extends Error {}

interface Selectable {
  id: string;
  tags: readonly string[];
}

/** True when the selection names nothing (every scenario is kept). */
export function selectsAll(selection: ScenarioSelection | undefined): boolean {
  return !selection || ((selection.tags ?? []).length === 0 && (selection.excludeTags ?? []).length === 0 && !selection.grep);
}

/** The scenarios the selection keeps, in their order; a bad pattern is a SelectionError. */
export function selectScenarios<T extends Selectable>(scenarios: readonly T[], selection: ScenarioSelection | undefined): T[] {
  if (selectsAll(selection)) return [...scenarios];
  const tags = selection?.tags ?? [];
  const excluded = selection?.excludeTags ?? [];
  let pattern: RegExp | null = null;
  if (selection?.grep) {
    try {
      pattern = new RegExp(selection.grep);
    } catch (error) {
      throw new SelectionError(`--grep ${selection.grep}: not a regular expression (${(error as Error).message})`);
    }
  }
  return scenarios.filter(
    (s) => tags.every((t) => s.tags.includes(t)) && !excluded.some((t) => s.tags.includes(t)) && (pattern === null || pattern.test(s.id)),
  );
}

/** The selection as the flags that say it, for messages: "--tag wet --grep ^ramp". */
export function describeSelection(selection: ScenarioSelection): string {
  return [
    ...(selection.tags ?? []).map((t) => `--tag ${t}`),
    ...(selection.excludeTags ?? []).map((t) => `--exclude-tag ${t}`),
    ...(selection.grep ? [`--grep ${selection.grep}`] : []),
  ].join(' ');
}

/** Why nothing was kept: the selection and the tags the scenarios do carry. */
export function nothingSelected(selection: ScenarioSelection, scenarios: readonly Selectable[]): string {
  const known = [...new Set(scenarios.flatMap((s) => s.tags))].sort();
  return `${describeSelection(selection)}: no scenario of ${scenarios.length} matches (their tags: ${known.join(', ') || 'none'})`;
}
