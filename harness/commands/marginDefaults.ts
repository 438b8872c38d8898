// `footing margin`'s defaults, apart from the command so the CLI's option table loads without it.

import { MARGIN_DEFAULTS } from '../margin/defaults.js';

/** What `footing margin` uses when not told otherwise. */
export const MARGIN_COMMAND_DEFAULTS = Object.freeze({ out: 'reports/out/margin', tolerance: MARGIN_DEFAULTS.tolerance });
