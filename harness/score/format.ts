// Number formatting for human sentences ("slip distance 0.31 m > 0.05 m"): two decimals, more when
// two decimals would print a value and its limit alike (0.004 vs 0.001), at most six.

const MIN_DECIMALS = 2;
const MAX_DECIMALS = 6;

export function formatFixed(value: number, decimals = MIN_DECIMALS): string {
  const text = value.toFixed(decimals);
  return /^-0\.?0*$/.test(text) ? text.slice(1) : text;
}

/** Formats a value and the limit it is compared with so the two read differently when they differ. */
export function formatPair(value: number, limit: number): [string, string] {
  for (let decimals = MIN_DECIMALS; decimals <= MAX_DECIMALS; decimals++) {
    const a = formatFixed(value, decimals);
    const b = formatFixed(limit, decimals);
    if (a !== b || decimals === MAX_DECIMALS) return [a, b];
  }
  return [formatFixed(value), formatFixed(limit)];
}

export function plural(count: number, singular: string, pluralForm = `${singular}s`): string {
  return `${count} ${count === 1 ? singular : pluralForm}`;
}
