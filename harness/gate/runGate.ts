// The gate command without the CLI: read both result sets and the policy, gate, write gate.md,
// return the exit code and the text to print. 0 = hold, 1 = a rule broken, 2 = bad input.

import { join } from 'node:path';
import { writeFileAtomicSync } from '../run/atomic.js';
import { readResultsFile, ResultsReadError } from '../run/results/read.js';
import { defaultPolicy, type GatePolicy } from './defaults.js';
import { gate } from './gate.js';
import { loadPolicy, PolicyError } from './policy.js';
import { renderGateMarkdown, renderGateText } from './render.js';
import { GateInputError } from './types.js';
import { describeDivergence, gateDivergences, renderDivergenceMarkdown } from '../recorded/divergence.js';

export const GATE_EXIT = { hold: 0, block: 1, badInput: 2 } as const;
export const GATE_REPORT_NAME = 'gate.md';

export interface RunGateArgs {
  /** results.json or a folder holding one. */
  baseline: string;
  candidate: string;
  policyFile?: string;
  /** "BASE=CAND" build pairs. */
  pairs?: string[];
  /** Folder to write gate.md into (created if needed); omitted: nothing written. */
  out?: string;
}

export interface RunGateResult {
  exitCode: 0 | 1 | 2;
  text: string;
}

export function parsePairs(pairs: readonly string[]): [string, string][] {
  return pairs.map((text) => {
    const at = text.indexOf('=');
    const base = text.slice(0, at).trim();
    const cand = text.slice(at + 1).trim();
    if (at < 0 || base === '' || cand === '' || cand.includes('=')) {
      throw new GateInputError(`--pair "${text}": expected BASE=CAND, two build names joined by "="`);
    }
    return [base, cand];
  });
}

export async function runGate(args: RunGateArgs): Promise<RunGateResult> {
  let text: string;
  let exitCode: 0 | 1;
  try {
    const policy: GatePolicy = args.policyFile === undefined ? defaultPolicy() : loadPolicy(args.policyFile);
    const pairs = parsePairs(args.pairs ?? []);
    const baseline = readResultsFile(args.baseline);
    const candidate = readResultsFile(args.candidate);
    const outcome = gate({ baseline: baseline.results, candidate: candidate.results, policy, pairs });
    if (outcome.compared === 0) {
      const why = [
        ...outcome.notComparable.map((n) => `  not comparable: ${n.scenario}: ${n.reason}`),
        ...outcome.unpaired.map((u) => `  unpaired: ${u.side} ${u.build}${u.scenario === null ? '' : ` ${u.scenario}`}: ${u.reason}`),
      ];
      return {
        exitCode: GATE_EXIT.badInput,
        text: [`gate: nothing to compare between ${baseline.file} and ${candidate.file}`, ...why].join('\n'),
      };
    }
    text = renderGateText(outcome);
    exitCode = outcome.verdict === 'block' ? GATE_EXIT.block : GATE_EXIT.hold;
    // --- first divergence of the traces (harness/recorded/divergence.ts) ---
    const divergences = gateDivergences(baseline, candidate, outcome.buildPairs);
    for (const d of divergences) if (!d.unavailable) text += `\nfirst divergence: ${d.scenario} (${d.baselineBuild} → ${d.candidateBuild}): ${describeDivergence(d)}`;
    // --- end first divergence ---
    if (args.out !== undefined) {
      const file = join(args.out, GATE_REPORT_NAME);
      writeFileAtomicSync(file, renderGateMarkdown(outcome) + renderDivergenceMarkdown(divergences));
      text += `\nwrote ${file}`;
    }
  } catch (error) {
    if (error instanceof PolicyError || error instanceof ResultsReadError || error instanceof GateInputError) {
      return { exitCode: GATE_EXIT.badInput, text: `gate: ${error.message}` };
    }
    throw error;
  }
  return { exitCode, text };
}
