// The report entry point the runner calls. Minimal page until the full report lands: a table of
// every run, all text escaped.
import type { ResultsFile } from '../run/results/types.js';

const escapeHtml = (text: string): string =>
  text.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] as string);

export interface ReportOptions {
  /** Folder the report is written to (trace links are relative to it). */
  outDir: string;
}

export function renderReportHtml(results: ResultsFile, _options: ReportOptions): string {
  const rows = results.runs
    .map((r) => `<tr><td>${escapeHtml(r.scenario.id)}</td><td>${escapeHtml(r.build)}</td><td>${r.status}</td><td>${escapeHtml(r.reasons.join('; '))}</td></tr>`)
    .join('\n');
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Footing results</title></head><body>
<h1>Footing results</h1><table><thead><tr><th>scenario</th><th>build</th><th>status</th><th>reasons</th></tr></thead><tbody>
${rows}
</tbody></table><p>Simulation is not proof of safety on hardware.</p></body></html>`;
}
