// What a log reader hands on: one column of raw numbers per slot (in the log's own units), the
// sample times already in seconds, and how to name a sample in messages (CSV line, MCAP message).

export interface RawLog {
  /** The log file as shown in messages. */
  display: string;
  count: number;
  time_s: Float64Array;
  /** values[slot][sample], in the log's units. */
  values: Float64Array[];
  /** `file:line` or `file topic … message n` of a sample, for messages. */
  where(sample: number): string;
}

export type ReadResult = { ok: true; log: RawLog } | { ok: false; errors: string[] };

/** Reports progress as a fraction of the file read (0–1). */
export type ProgressCallback = (fraction: number) => void;

/** More than this many problems in one log are summarised: the first ones name the cause. */
export const MAX_REPORTED_ROWS = 20;
