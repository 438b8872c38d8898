// The margin search's defaults, apart from the search so `footing margin --help` can show them
// without loading it.

/**
 * Search settings, the one place these defaults live. Tolerance 0.01 of the scenario's own
 * friction is finer than the spread of friction between two mops of one floor (common practice).
 * Friction is searched down to 0.05 × (below wet ice for any floor of μs ≤ 1, from memory) or up
 * to 3 ×; pushes from 0 (no push) to 3 × the written shove. Two checks plus the two ends are the
 * monotonicity samples: 11 runs for friction and 12 for pushes (the nominal run is shared).
 */
export const MARGIN_DEFAULTS = Object.freeze({
  tolerance: 0.01,
  frictionRange: [0.05, 3] as readonly [number, number],
  pushRange: [0, 3] as readonly [number, number],
  checks: 2,
});
