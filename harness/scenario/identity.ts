// Results carry a scenario's id, revision and content hash, so a baseline is only compared with
// the same content. An edit that changes the hash without a new revision is worth a warning: the
// author probably forgot to bump the revision, and old results no longer describe this scenario.

export interface ScenarioIdentity {
  id: string;
  revision: number;
  hash: string;
}

export type IdentityComparison =
  | { kind: 'same' }
  | { kind: 'revised'; message: string }
  | { kind: 'changedWithoutRevision'; message: string }
  | { kind: 'otherScenario'; message: string };

export function compareIdentity(baseline: ScenarioIdentity, current: ScenarioIdentity): IdentityComparison {
  if (baseline.id !== current.id) {
    return { kind: 'otherScenario', message: `baseline is scenario ${baseline.id}, current is ${current.id}` };
  }
  if (baseline.revision !== current.revision) {
    return { kind: 'revised', message: `scenario ${current.id} is revision ${current.revision}, the baseline was run on revision ${baseline.revision}; the results are not comparable` };
  }
  if (baseline.hash !== current.hash) {
    return {
      kind: 'changedWithoutRevision',
      message: `scenario ${current.id} changed (hash ${current.hash.slice(0, 12)}, baseline ${baseline.hash.slice(0, 12)}) but its revision is still ${current.revision}; bump revision when the content changes`,
    };
  }
  return { kind: 'same' };
}
