// Lays the view model out with the handlebars templates of reports/templates/ (one partial per
// section). Templates use {{ }} (escaped) for every string from results, scenarios and builds;
// triple-stash appears only on SvgMarkup fields (built from numbers by plot/, any results text
// inside passed through escapeXml) and on our own inline CSS and JS files.

import { readdirSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import path from 'node:path';
import Handlebars from 'handlebars';
import type { ReportModel } from './model.js';

export const TEMPLATE_DIR = fileURLToPath(new URL('../../reports/templates/', import.meta.url));

interface Compiled {
  page: Handlebars.TemplateDelegate;
  css: string;
  js: string;
}

let compiled: Compiled | null = null;

function compile(): Compiled {
  if (compiled) return compiled;
  const env = Handlebars.create();
  const partialDir = path.join(TEMPLATE_DIR, 'partials');
  for (const name of readdirSync(partialDir)) {
    if (!name.endsWith('.hbs')) continue;
    env.registerPartial(name.slice(0, -'.hbs'.length), readFileSync(path.join(partialDir, name), 'utf8'));
  }
  const page = env.compile(readFileSync(path.join(TEMPLATE_DIR, 'report.hbs'), 'utf8'), { strict: false, preventIndent: true });
  compiled = {
    page,
    css: readFileSync(path.join(TEMPLATE_DIR, 'report.css'), 'utf8'),
    js: readFileSync(path.join(TEMPLATE_DIR, 'report.js'), 'utf8'),
  };
  return compiled;
}

export function renderModel(model: ReportModel): string {
  const { page, css, js } = compile();
  return page({ model, css, js });
}
