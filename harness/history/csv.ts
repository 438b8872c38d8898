// `history export --csv`: one row per stored metric value (the long, tidy shape spreadsheets and
// data frames pivot easily), fields quoted by RFC 4180 when they hold a comma, quote or line break.

import type { ExportRow } from './types.js';

export const CSV_HEADER = ['started_at', 'commit', 'build', 'build_commit', 'scenario', 'scenario_revision', 'scenario_hash', 'status', 'metric', 'value'] as const;

export function csvField(value: string | number | null): string {
  const text = value === null ? '' : String(value);
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

export function csvLine(row: ExportRow): string {
  return [row.startedAt, row.commit, row.build, row.buildCommit, row.scenario, row.scenarioRevision, row.scenarioHash, row.status, row.metric, row.value].map(csvField).join(',');
}
