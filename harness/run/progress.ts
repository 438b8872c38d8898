// Progress of a suite: a bar on a terminal (runs done/total, failures so far, ETA), plain lines
// otherwise (CI logs, pipes, --quiet prints only the end).

import cliProgress from 'cli-progress';
import { firstReason } from '../results/runResult.js';
import type { RunResult } from '../results/types.js';

export type ProgressMode = 'bar' | 'lines' | 'quiet';

export interface Progress {
  done(result: RunResult, wall_s: number): void;
  stop(): void;
}

/** Longest reason kept on a progress line; the whole text is in summary.md and the report. */
const REASON_CHARS = 160;

/** ": <first reason>" for a failed or errored run, '' for a pass; control characters removed. */
export function reasonSuffix(result: RunResult): string {
  if (result.status === 'pass') return '';
  // eslint-disable-next-line no-control-regex
  const text = firstReason(result).replace(/[\u0000-\u001f\u007f-\u009f]+/g, ' ').trim();
  return `: ${text.length > REASON_CHARS ? `${text.slice(0, REASON_CHARS - 1)}…` : text}`;
}

export function chooseProgressMode(options: { quiet?: boolean; stream?: NodeJS.WriteStream }): ProgressMode {
  if (options.quiet) return 'quiet';
  const stream = options.stream ?? process.stderr;
  if (process.env.CI === 'true' || process.env.CI === '1' || !stream.isTTY) return 'lines';
  return 'bar';
}

export function createProgress(mode: ProgressMode, total: number, log: (line: string) => void): Progress {
  let finished = 0;
  let failures = 0;
  if (mode === 'bar') {
    const bar = new cliProgress.SingleBar(
      {
        format: 'runs {bar} {value}/{total} | failures {failures} | ETA {eta_formatted} | {last}',
        hideCursor: true,
        clearOnComplete: false,
        stream: process.stderr,
      },
      cliProgress.Presets.shades_classic,
    );
    bar.start(total, 0, { failures: 0, last: '' });
    return {
      done(result) {
        finished++;
        if (result.status !== 'pass') {
          failures++;
          // The bar redraws its last line: print a failure above it so its reason stays on screen.
          bar.stop();
          process.stderr.write(`${result.status} ${result.scenario.id} × ${result.build}${reasonSuffix(result)}\n`);
          bar.start(total, finished, { failures, last: '' });
        }
        bar.update(finished, { failures, last: `${result.status} ${result.scenario.id} × ${result.build}` });
      },
      stop() {
        bar.stop();
      },
    };
  }
  return {
    done(result, wall_s) {
      finished++;
      if (result.status !== 'pass') failures++;
      if (mode === 'lines') {
        const width = String(total).length;
        log(`[${String(finished).padStart(width)}/${total}] ${result.status.padEnd(5)} ${result.scenario.id} × ${result.build} (${wall_s.toFixed(1)} s)${reasonSuffix(result)}`);
      }
    },
    stop() {},
  };
}
