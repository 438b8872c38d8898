// The builds footing.config.yaml resolved, made ready to run: every git-ref build checked out
// and built (from the cache when its commit was built before) — the one git preparation `run`,
// `margin` and `bench` share. Every ref is resolved before anything is built: a typo in the last
// ref should not cost a build, and a ref that names no commit is bad input.

import { GitRefError, prepareGitBuild, resolveRef } from '../builds/git.js';
import { itemLabel, type ResolvedBuild } from '../config/resolve.js';
import type { PreparedBuild } from '../run/prepare.js';

export type GitPreparation = { ok: true; prepared: PreparedBuild[] } | { ok: false; lines: string[] };

/**
 * A build whose command fails or leaves no entry is returned with its `failure` (run makes its
 * runs `error` runs; margin and bench refuse it); refs that name no commit are `ok: false`.
 */
export async function prepareConfiguredBuilds(builds: readonly ResolvedBuild[], log: (line: string) => void): Promise<GitPreparation> {
  const refProblems: string[] = [];
  for (const build of builds) {
    if (build.kind !== 'git') continue;
    try {
      await resolveRef(build.recipe.repo, build.recipe.ref);
    } catch (error) {
      if (!(error instanceof GitRefError)) throw error;
      refProblems.push(`${itemLabel(build.origin)}: ${error.message}`);
    }
  }
  if (refProblems.length > 0) return { ok: false, lines: refProblems };

  const prepared: PreparedBuild[] = [];
  for (const build of builds) {
    if (build.kind === 'spec') {
      prepared.push({ spec: build.spec });
      continue;
    }
    const started = performance.now();
    const outcome = await prepareGitBuild(build.recipe);
    const took = ((performance.now() - started) / 1000).toFixed(1);
    if (outcome.ok) {
      log(`build ${build.name}: git ${build.recipe.ref} → ${outcome.origin.commit.slice(0, 12)} ${outcome.origin.cached ? '(cached)' : `(built in ${took} s)`}`);
      prepared.push({ spec: outcome.spec, manifest: outcome.manifest });
    } else {
      const message = `${itemLabel(build.origin)}: ${outcome.message}`;
      log(`build ${build.name} FAILED: ${message}`);
      if (outcome.outputTail !== '') for (const line of outcome.outputTail.split('\n')) log(`  | ${line}`);
      prepared.push({
        spec: { name: build.name, kind: build.recipe.kind, entry: build.recipe.entry, args: [], options: {}, cwd: build.recipe.repo, text: `${build.name}=${build.text}` },
        manifest: { name: build.name, kind: build.recipe.kind, entry: build.recipe.entry, commit: outcome.origin.commit ?? null, dirty: null, origin: { repo: build.recipe.repo, ref: build.recipe.ref, commit: outcome.origin.commit ?? null, build: build.recipe.build ?? null, failed: true } },
        failure: { message, outputTail: outcome.outputTail },
      });
    }
  }
  return { ok: true, prepared };
}
