// `footing cache --clear`: the cache of git-ref builds (.footing-cache/ by default).

import { clearGitCache } from '../builds/git.js';
import type { RunFlags } from '../config/resolve.js';
import { displayPath } from '../scenario/paths.js';
import { resolveForCommand } from './config.js';
import { EXIT } from './exit.js';
import type { CommandOutcome } from './skeleton.js';

/** `footing cache --clear`: removes the git-build cache of the project (worktrees unregistered). */
export async function clearCache(flags: RunFlags): Promise<CommandOutcome> {
  const resolved = resolveForCommand({ ...flags, suite: undefined, builds: undefined, baseline: undefined, paths: undefined });
  if (!resolved.ok) return { exitCode: EXIT.badInput, lines: resolved.lines };
  const settings = resolved.settings;
  const outcome = await clearGitCache(settings.cache.value);
  return { exitCode: EXIT.pass, lines: outcome.lines.map((line) => line.replace(settings.cache.value, displayPath(settings.cache.value, settings.cwd))) };
}
