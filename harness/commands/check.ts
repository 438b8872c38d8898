// `footing check [paths..]`: validates scenario and robot files without running anything.

import { formatIssue } from '../files/issue.js';
import { DEFAULT_SCENARIO_PATHS } from '../scenario/paths.js';
import { describeSelection, nothingSelected, selectScenarios, selectsAll, SelectionError, type ScenarioSelection } from '../scenario/select.js';
import { loadSuite, type SuiteOptions } from '../scenario/suite.js';
import { EXIT } from './exit.js';
import type { CommandOutcome } from './skeleton.js';

/** `footing check [paths..]`: one line per file, its problems indented below; exit 0 or 2. */
export async function checkPaths(paths: readonly string[], opts: SuiteOptions = {}, selection?: ScenarioSelection): Promise<CommandOutcome> {
  const suite = await loadSuite(paths.length ? [...paths] : [...DEFAULT_SCENARIO_PATHS], opts);
  const lines: string[] = [];
  for (const e of suite.errors) lines.push(`${e.file}: ${e.message}`);
  let good = 0;
  for (const f of suite.files) {
    const count = (n: number, word: string) => `${n} ${word}${n === 1 ? '' : 's'}`;
    const what = f.kind === 'robot' ? 'robot' : f.scenarioIds.length > 1 ? count(f.scenarioIds.length, 'scenario') : '';
    const extras = [what, f.warnings.length ? count(f.warnings.length, 'warning') : ''].filter(Boolean).join(', ');
    if (f.errors.length === 0) {
      good++;
      lines.push(`${f.file}: ok${extras ? ` (${extras})` : ''}`);
    } else {
      lines.push(`${f.file}: ${count(f.errors.length, 'error')}${f.warnings.length ? `, ${count(f.warnings.length, 'warning')}` : ''}`);
    }
    for (const e of f.errors) lines.push(`  ${formatIssue(e)}`);
    for (const w of f.warnings) lines.push(`  warning: ${formatIssue(w)}`);
  }
  const scenarioCount = suite.scenarios.length;
  lines.push(
    `checked ${suite.files.length} file${suite.files.length === 1 ? '' : 's'}: ${good} ok, ${suite.files.length - good} with errors; ${scenarioCount} scenario${scenarioCount === 1 ? '' : 's'}`,
  );
  if (suite.ok && selection && !selectsAll(selection)) {
    // What run and margin would take with the same flags: the ids, or why none.
    try {
      const kept = selectScenarios(suite.scenarios, selection);
      if (kept.length === 0) return { exitCode: EXIT.badInput, lines: [...lines, nothingSelected(selection, suite.scenarios)] };
      lines.push(`${describeSelection(selection)} selects ${kept.length} of ${scenarioCount}: ${kept.map((s) => s.id).join(', ')}`);
    } catch (error) {
      if (error instanceof SelectionError) return { exitCode: EXIT.badInput, lines: [...lines, error.message] };
      throw error;
    }
  }
  return { exitCode: suite.ok ? EXIT.pass : EXIT.badInput, lines };
}
