import { describe, expect, it } from 'vitest';
import { defaultPolicy } from '../../harness/gate/defaults.js';
import { renderTrendPage } from '../../harness/history/render.js';
import { buildTrendModel } from '../../harness/history/trend.js';
import { generatedStore, HOSTILE_BUILD, PLANTED } from './support.js';

describe('trend page data', () => {
  it('flags the planted change point, between the nights either side of it, and no other margin line', () => {
    const { store } = generatedStore();
    const model = buildTrendModel(store, { policy: defaultPolicy(), metrics: ['stanceMargin.min'] });
    const flagged = model.scenarios.flatMap((s) => s.lines.filter((l) => l.changes.length > 0).map((l) => `${s.id}/${l.build}`));
    expect(flagged).toEqual(['generated-002/build-1']);
    const line = model.scenarios.find((s) => s.id === 'generated-002')?.lines.find((l) => l.build === 'build-1');
    expect(line?.changePoints.map((c) => [c.before, c.after])).toEqual([[PLANTED.fromNight - 1, PLANTED.fromNight]]);
    const nights = store.nights();
    expect(line?.changes[0]).toMatchObject({
      before: { startedAt: nights[PLANTED.fromNight - 1].startedAt, commit: (nights[PLANTED.fromNight - 1].commit as string).slice(0, 8) },
      after: { startedAt: nights[PLANTED.fromNight].startedAt, commit: (nights[PLANTED.fromNight].commit as string).slice(0, 8) },
      direction: 'worse',
    });
    expect(Number(line?.changes[0].shift.replace('−', '-'))).toBeCloseTo(PLANTED.marginShift, 1);
    // The gate line is drawn 0.02 (the default allowance) under the first night's value.
    expect(line?.limit).toMatch(/^loss ≤ 0\.02 → ≥ 0\.\d{5}$/);
    store.close();
  });

  it('flags nothing in flat noisy data', () => {
    const { store } = generatedStore({ step: undefined, seed: 18 });
    const model = buildTrendModel(store, { policy: defaultPolicy() });
    expect(model.scenarios.flatMap((s) => s.lines).length).toBe(4 * 2 * 6);
    expect(model.changeCount).toBe(0);
    store.close();
  });

  it('cuts each line to the last N nights with --last', () => {
    const { store } = generatedStore();
    const model = buildTrendModel(store, { policy: defaultPolicy(), last: 20, scenarios: ['generated-002'], builds: ['build-1'] });
    expect(model.scenarios).toHaveLength(1);
    for (const line of model.scenarios[0].lines) expect(line.nights).toBe(20);
    store.close();
  });

  it('escapes every string from the store in the page and loads nothing from outside it', () => {
    const { store } = generatedStore();
    const html = renderTrendPage(buildTrendModel(store, { policy: defaultPolicy() }));
    expect(html).not.toContain('<img');
    expect(html).toContain('&lt;img src&#x3D;x onerror&#x3D;&quot;alert(1)&quot;&gt;&amp;build');
    expect(html).not.toMatch(/<script|src="http|href="http/);
    expect(html).toContain('Pettitt 1979');
    expect(HOSTILE_BUILD).toContain('<img');
    store.close();
  });
});
