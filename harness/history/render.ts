// The trend page: reports/templates/history.hbs over the model of trend.ts. Like the build report
// (harness/report/render.ts): one self-contained file, no script, no network (a Content Security
// Policy forbids both), every string from the store through {{ }} escaping; triple-stash only on
// SvgMarkup built from numbers (trendPlot.ts).

import { readFileSync } from 'node:fs';
import path from 'node:path';
import Handlebars from 'handlebars';
import { TEMPLATE_DIR } from '../report/render.js';
import type { TrendModel } from './trend.js';

let page: Handlebars.TemplateDelegate | null = null;

export function renderTrendPage(model: TrendModel): string {
  page ??= Handlebars.create().compile(readFileSync(path.join(TEMPLATE_DIR, 'history.hbs'), 'utf8'), { strict: false, preventIndent: true });
  return page({ model });
}
