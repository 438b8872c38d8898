// `footing gate`: read both result sets and the policy, gate, write gate.md, return the exit code
// and the lines to print. 0 = hold, 1 = a rule broken, 2 = bad input.

import { join } from 'node:path';
import { writeFileAtomicSync } from '../files/atomic.js';
import { readResultsFile, ResultsReadError } from '../results/read.js';
import { defaultPolicy, type GatePolicy } from '../gate/defaults.js';
import { gate } from '../gate/gate.js';
import { loadPolicy, PolicyError } from '../gate/policy.js';
import { renderGateMarkdown, renderGateText } from '../gate/render.js';
import { parsePairs } from '../gate/pairing.js';
import { GateInputError } from '../gate/types.js';
import { describeDivergence, gateDivergences, renderDivergenceMarkdown } from '../results/divergence.js';
import { EXIT, type ExitCode } from './exit.js';
import { OUTPUT_FILES } from './outputs.js';
import type { CommandOutcome } from './skeleton.js';

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

export async function runGate(args: RunGateArgs): Promise<CommandOutcome> {
  let text: string;
  let exitCode: ExitCode;
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
      return { exitCode: EXIT.badInput, lines: [`gate: nothing to compare between ${baseline.file} and ${candidate.file}`, ...why] };
    }
    text = renderGateText(outcome);
    exitCode = outcome.verdict === 'block' ? EXIT.fail : EXIT.pass;
    // Where the candidate's traces first part from the baseline's (when both kept traces).
    const divergences = gateDivergences(baseline, candidate, outcome.buildPairs);
    for (const d of divergences) if (!d.unavailable) text += `\nfirst divergence: ${d.scenario} (${d.baselineBuild} → ${d.candidateBuild}): ${describeDivergence(d)}`;
    if (args.out !== undefined) {
      const file = join(args.out, OUTPUT_FILES.gate);
      writeFileAtomicSync(file, renderGateMarkdown(outcome) + renderDivergenceMarkdown(divergences));
      text += `\nwrote ${file}`;
    }
  } catch (error) {
    if (error instanceof PolicyError || error instanceof ResultsReadError || error instanceof GateInputError) {
      return { exitCode: EXIT.badInput, lines: [`gate: ${error.message}`] };
    }
    throw error;
  }
  return { exitCode, lines: text.split('\n') };
}
