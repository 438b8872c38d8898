import { describe, expect, it } from 'vitest';
import { buildReportModel } from '../../harness/report/model.js';
import { compileTemplates, precompiledTemplatesModule, readSources, type Precompiled } from '../../harness/report/render.js';
import { smallRun } from './support.js';

describe('report templates precompiled at build time', () => {
  it('render the same page as the templates compiled from the sources', async () => {
    const { dir, results } = await smallRun();
    const model = buildReportModel(results, { outDir: dir, baseline: 'nominal', generatedAt: new Date(0) });
    // The module the build writes, loaded as CommonJS is.
    const module: { exports: Precompiled } = { exports: {} as Precompiled };
    new Function('module', precompiledTemplatesModule())(module);
    const sources = readSources();
    const fromSources = compileTemplates(sources, null);
    const precompiled = compileTemplates(sources, module.exports);
    const page = fromSources.page({ model, css: fromSources.css, js: fromSources.js });
    expect(page.length).toBeGreaterThan(10000);
    expect(precompiled.page({ model, css: precompiled.css, js: precompiled.js })).toBe(page);
  });
});
