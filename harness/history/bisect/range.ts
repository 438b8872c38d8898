// The commits a bisect searches: the first-parent line from the good commit (exclusive) to the bad
// one (inclusive), oldest first — a merge is judged as the commit that brought its branch in, as a
// nightly on the main line sees it. git runs with argument arrays (harness/builds/git.ts).

import { git, GitRefError, resolveRef } from '../../builds/git.js';

export interface RangeCommit {
  commit: string;
  subject: string;
}

export interface CommitRange {
  repoRoot: string;
  good: RangeCommit;
  /** Oldest first; the last is the bad commit. */
  commits: RangeCommit[];
}

export async function commitRange(repo: string, goodRef: string, badRef: string): Promise<CommitRange> {
  const good = await resolveRef(repo, goodRef);
  const bad = await resolveRef(repo, badRef);
  const ancestor = await git(good.repoRoot, ['merge-base', '--is-ancestor', good.commit, bad.commit]);
  if (ancestor.code !== 0) {
    throw new GitRefError(`--good ${goodRef} (${good.commit.slice(0, 12)}) is not an ancestor of --bad ${badRef} (${bad.commit.slice(0, 12)}): a bisect needs the good commit on the bad commit's history`);
  }
  const log = await git(good.repoRoot, ['log', '--first-parent', '--reverse', '--format=%H%x00%s', `${good.commit}..${bad.commit}`]);
  if (log.code !== 0) throw new GitRefError(`git log ${goodRef}..${badRef} failed: ${log.output.trim().split('\n')[0]}`);
  const commits = log.output.split('\n').filter(Boolean).map((line) => {
    const [commit, subject] = line.split('\0');
    return { commit, subject: subject ?? '' };
  });
  const goodSubject = await git(good.repoRoot, ['log', '-1', '--format=%s', good.commit]);
  return { repoRoot: good.repoRoot, good: { commit: good.commit, subject: goodSubject.output.trim() }, commits };
}
