// `matrix:` expansion. A file with a matrix block is a template: every string containing
// ${name} gets the parameter's value, and one scenario is produced per parameter set.
//
//   matrix:
//     axes:                         # every combination (here 3 × 2 = 6 scenarios)
//       mu: [0.2, 0.4, 0.6]
//       speed_mps: [0.3, 0.5]
//   id: hall-mu${mu}-v${speed_mps}  # numbers in ids are spelt id-safe: 0.2 → 0p2, -1 → m1
//   ground: { material: { staticFriction: "${mu}" } }   # a whole-string placeholder keeps the type
//
//   matrix:
//     cases:                        # an explicit list, for values that go together
//       - { mu_s: 0.2, mu_k: 0.15 }
//       - { mu_s: 0.6, mu_k: 0.45 }

import { pointerJoin, type Finding } from '../files/issue.js';
import { isRecord } from '../files/source.js';
import { suggestName } from '../files/suggest.js';

export type MatrixValue = number | string | boolean;
/** More scenarios from one file than this is almost surely a mistake. */
export const MAX_MATRIX_SCENARIOS = 256;

export interface MatrixInstance {
  data: Record<string, unknown>;
  params: Record<string, MatrixValue>;
  /** `mu=0.2, speed_mps=0.3`, for messages. */
  label: string;
}

export type MatrixOutcome =
  | { ok: true; instances: MatrixInstance[]; warnings: Finding[] }
  | { ok: false; errors: Finding[] };

const PLACEHOLDER = /\$\{([^}]*)\}/g;
const WHOLE_PLACEHOLDER = /^\$\{([^}]*)\}$/;
const HAS_PLACEHOLDER = /\$\{[^}]*\}/;

/** The matrix block has passed the schema's $defs/matrix before this is called. */
export function expandMatrix(template: Record<string, unknown>): MatrixOutcome {
  const matrix = template.matrix as { axes?: Record<string, MatrixValue[]>; cases?: Record<string, MatrixValue>[] };
  const body: Record<string, unknown> = { ...template };
  delete body.matrix;
  const errors: Finding[] = [];

  let sets: Record<string, MatrixValue>[];
  let names: string[];
  if (matrix.axes) {
    names = Object.keys(matrix.axes);
    const total = names.reduce((n, k) => n * matrix.axes![k].length, 1);
    if (total > MAX_MATRIX_SCENARIOS) {
      return { ok: false, errors: [{ path: '/matrix/axes', message: `expands to ${total} scenarios, more than the ${MAX_MATRIX_SCENARIOS} allowed per file` }] };
    }
    sets = [{}];
    for (const name of names) {
      const next: Record<string, MatrixValue>[] = [];
      for (const partial of sets) for (const value of matrix.axes[name]) next.push({ ...partial, [name]: value });
      sets = next;
    }
  } else {
    const cases = matrix.cases!;
    names = Object.keys(cases[0]);
    cases.forEach((c, i) => {
      const keys = Object.keys(c);
      const missing = names.filter((n) => !keys.includes(n));
      const extra = keys.filter((k) => !names.includes(k));
      if (missing.length || extra.length) {
        errors.push({
          path: `/matrix/cases/${i}`,
          message: `case names ${keys.join(', ')} but case 0 names ${names.join(', ')} (expected every case to name the same parameters)`,
        });
      }
    });
    sets = cases;
  }
  if (errors.length) return { ok: false, errors };

  // Placeholders are checked once on the template so each problem is reported once.
  const used = new Set<string>();
  walkStrings(body, '', (text, pointer) => {
    for (const m of text.matchAll(PLACEHOLDER)) {
      const name = m[1];
      if (names.includes(name)) used.add(name);
      else {
        const best = suggestName(name, names);
        errors.push({
          path: pointer,
          message: `\${${name}} is not a matrix parameter (parameters: ${names.join(', ')})`,
          hint: best ? `did you mean \${${best}}?` : undefined,
        });
      }
    }
  });
  if (errors.length) return { ok: false, errors };
  const warnings: Finding[] = names
    .filter((n) => !used.has(n))
    .map((n) => ({ path: matrix.axes ? pointerJoin('/matrix/axes', n) : '/matrix/cases/0', at: 'key' as const, message: `matrix parameter "${n}" is not used anywhere in the file` }));
  if (typeof body.id === 'string' && !HAS_PLACEHOLDER.test(body.id)) {
    errors.push({ path: '/id', message: `id "${body.id}" has no \${…} placeholder, so every matrix scenario would get the same id (expected e.g. ${body.id}-\${${names[0]}})` });
    return { ok: false, errors };
  }

  const instances: MatrixInstance[] = sets.map((params) => ({
    data: substitute(body, params, '') as Record<string, unknown>,
    params,
    label: names.map((n) => `${n}=${params[n]}`).join(', '),
  }));
  const seen = new Map<unknown, string>();
  for (const inst of instances) {
    const id = inst.data.id;
    if (typeof id !== 'string') continue; // a missing id is the schema's to report
    if (seen.has(id)) {
      errors.push({ path: '/id', message: `matrix cases ${seen.get(id)} and ${inst.label} both produce id ${JSON.stringify(id)} (expected the id to contain every parameter that varies)` });
    } else seen.set(id, inst.label);
  }
  if (errors.length) return { ok: false, errors };
  return { ok: true, instances, warnings };
}

function walkStrings(v: unknown, pointer: string, visit: (text: string, pointer: string) => void): void {
  if (typeof v === 'string') visit(v, pointer);
  else if (Array.isArray(v)) v.forEach((item, i) => walkStrings(item, pointerJoin(pointer, i), visit));
  else if (isRecord(v)) for (const [k, item] of Object.entries(v)) walkStrings(item, pointerJoin(pointer, k), visit);
}

function substitute(v: unknown, params: Record<string, MatrixValue>, pointer: string): unknown {
  if (typeof v === 'string') {
    const whole = WHOLE_PLACEHOLDER.exec(v);
    if (whole && pointer !== '/id') return params[whole[1]];
    const format = pointer === '/id' ? idFragment : String;
    return v.replace(PLACEHOLDER, (_, name: string) => format(params[name]));
  }
  if (Array.isArray(v)) return v.map((item, i) => substitute(item, params, pointerJoin(pointer, i)));
  if (isRecord(v)) {
    const out: Record<string, unknown> = {};
    for (const [k, item] of Object.entries(v)) out[k] = substitute(item, params, pointerJoin(pointer, k));
    return out;
  }
  return v;
}

/** A parameter value spelt so that it fits in an id: 0.2 → 0p2, -1.5 → m1p5, "Wet Tile" → wet-tile. */
export function idFragment(value: MatrixValue): string {
  if (typeof value === 'number') return String(value).replace(/\./g, 'p').replace(/-/g, 'm').replace(/\+/g, '');
  return String(value)
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '');
}
