// Units a log map may name, their factor to the harness's SI unit, and the unit a column or field
// name carries in its own spelling (`x_mm`, `roll[deg]`, `force (N)`), so a map that says one unit
// for a column named after another is refused instead of silently scaling the data.

export type Dimension = 'time' | 'length' | 'velocity' | 'angle' | 'angularVelocity' | 'force';

/** Factor from each unit to the SI unit of its dimension (s, m, m/s, rad, rad/s, N). */
export const UNIT_FACTORS: Readonly<Record<Dimension, Readonly<Record<string, number>>>> = {
  time: { s: 1, ms: 1e-3, us: 1e-6, ns: 1e-9 },
  length: { m: 1, cm: 1e-2, mm: 1e-3 },
  velocity: { mps: 1, mmps: 1e-3 },
  angle: { rad: 1, deg: Math.PI / 180 },
  angularVelocity: { radps: 1, degps: Math.PI / 180 },
  force: { N: 1, kN: 1e3 },
};

/** Other spellings of a unit seen in column names, mapped to the map's spelling. */
const SPELLINGS: Readonly<Record<string, string>> = {
  sec: 's', msec: 'ms', usec: 'us', nsec: 'ns', 'm/s': 'mps', 'mm/s': 'mmps', 'rad/s': 'radps', 'deg/s': 'degps', degrees: 'deg', radians: 'rad',
};

function dimensionOf(unit: string): Dimension | undefined {
  for (const [dimension, units] of Object.entries(UNIT_FACTORS)) if (unit in units) return dimension as Dimension;
  return undefined;
}

/**
 * The unit a name spells out: a trailing `_unit`, `[unit]` or `(unit)`. Only suffixes that are
 * units of some dimension count, so `foot_x` or `gait_s2` say nothing.
 */
export function unitInName(name: string): { unit: string; dimension: Dimension } | undefined {
  const bracket = /[[(]\s*([A-Za-z/]+)\s*[\])]\s*$/.exec(name);
  const underscore = /_([A-Za-z]+)$/.exec(name);
  const raw = bracket?.[1] ?? underscore?.[1];
  if (raw === undefined) return undefined;
  const unit = SPELLINGS[raw] ?? SPELLINGS[raw.toLowerCase()] ?? raw;
  const dimension = dimensionOf(unit);
  return dimension ? { unit, dimension } : undefined;
}

/** A message when `name` spells a unit other than `unit` (of `dimension`), else undefined. */
export function unitMismatch(name: string, unit: string, dimension: Dimension): string | undefined {
  const spelled = unitInName(name);
  if (!spelled || spelled.unit === unit) return undefined;
  if (spelled.dimension !== dimension) {
    return `unit mismatch: "${name}" is named in ${spelled.unit} (a ${spelled.dimension} unit), but the map reads it as ${dimension} in ${unit}`;
  }
  return `unit mismatch: "${name}" is named in ${spelled.unit}, but the map says unit: ${unit} (expected the unit the log uses)`;
}
