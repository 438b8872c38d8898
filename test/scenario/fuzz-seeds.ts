// Seeds for the property test: small valid files that together reach every loader stage.

import { readFileSync } from 'node:fs';
import { parse } from 'yaml';
import { BASE_YAML } from './helpers.js';

// Small seeds keep each case cheap (YAML parsing dominates); together they reach every stage:
// patches and raster, pushes and series, matrix expansion, migration from version 0, JSON.
const RICH = BASE_YAML.replace(
  '  material: { staticFriction: 0.9, kineticFriction: 0.7 }\n',
  `  material: { staticFriction: 0.9, kineticFriction: 0.7 }
  patches:
    - { name: strip, polygon_m: [[1, -2], [1.6, -2], [3.6, 2], [3, 2]], material: { staticFriction: 0.12, kineticFriction: 0.08 } }
    - { circle: { center_m: [5, 0], radius_m: 0.6 }, material: { staticFriction: 0.2 , kineticFriction: 0.1 } }
  raster: { origin_m: [8, -2], cell_m: 0.25, staticFriction: [[0.3, 0.6]], kineticFriction: [[0.2, 0.5]] }
`,
) + `pushes:
  - { at_s: 4, duration_s: 0.1, force_N: [0, 80, 0], shape: halfSine }
  - { series: series/shove-lateral.csv, point_m: [0.1, 0, 0] }
sensing: { frictionEstimate: { scale: 1.2 } }
acceptance: { minProgress: 0.7 }
`;
const MATRIX = BASE_YAML.replace('id: test-walk', 'matrix:\n  axes:\n    mu: [0.3, 0.6]\nid: hall-\${mu}').replace('staticFriction: 0.9', 'staticFriction: "\${mu}"').replace('kineticFriction: 0.7', 'kineticFriction: 0.2');
const V0 = readFileSync(new URL('./fixtures/dock-ice-v0.yaml', import.meta.url), 'utf8');
export const SEEDS = [BASE_YAML, RICH, MATRIX, V0, JSON.stringify(parse(RICH))];
export const SEEDS_BY_NAME = { base: BASE_YAML, rich: RICH, matrix: MATRIX, v0: V0, json: SEEDS[4] };
