// The report entry point the run, merge and margin commands call: one self-contained HTML file (inline
// CSS, inline SVG plots, a small optional script; no network) from a results set and the series
// files beside it. See docs/report.md.

import type { ResultsFile } from '../results/types.js';
import { buildReportModel, type ReportOptions } from './model.js';
import { renderModel } from './render.js';

export type { ReportOptions } from './model.js';
export { buildReportModel } from './model.js';

export function renderReportHtml(results: ResultsFile, options: ReportOptions): string {
  return renderModel(buildReportModel(results, options));
}
