// The `import` and `replay` verbs as functions returning { exitCode, lines } — the shape the
// commands layer takes; harness/cli/main.ts only parses flags and prints. A progress bar goes to
// a terminal's stderr on long logs.

import cliProgress from 'cli-progress';
import { importLog } from './importLog.js';
import { replayRecording } from './replay.js';

export interface CommandOutcome {
  exitCode: number;
  lines: string[];
}

/** Logs smaller than this import in about a second: no bar (common practice). */
const PROGRESS_MIN_BYTES = 20 * 1024 * 1024;

export async function importCommand(flags: { log: string; map: string; out: string; id?: string; progress?: boolean; logBytes?: number }): Promise<CommandOutcome> {
  const showBar = flags.progress === true && (flags.logBytes ?? 0) >= PROGRESS_MIN_BYTES;
  const bar = showBar ? new cliProgress.SingleBar({ format: 'import {bar} {percentage}% | ETA {eta_formatted}', stream: process.stderr, hideCursor: true }, cliProgress.Presets.shades_classic) : undefined;
  bar?.start(100, 0);
  try {
    const outcome = await importLog({ log: flags.log, map: flags.map, out: flags.out, id: flags.id, onProgress: bar ? (f) => bar.update(Math.round(f * 100)) : undefined });
    return { exitCode: outcome.exitCode, lines: outcome.lines };
  } finally {
    bar?.stop();
  }
}

export async function replayCommand(flags: { scenario: string; build: string; out: string }): Promise<CommandOutcome> {
  const outcome = await replayRecording(flags);
  return { exitCode: outcome.exitCode, lines: outcome.lines };
}
