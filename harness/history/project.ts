// What the history commands take from the project: the config file (for the store path and the
// gate policy) through the same resolution as `footing run`, so `--config`, `--policy` and the
// config's `gate` mean the same everywhere.

import { resolveSettings, settingsErrorLines, type ResolvedSettings } from '../config/resolve.js';
import { defaultPolicy, type GatePolicy } from '../gate/defaults.js';
import { loadPolicy, PolicyError } from '../gate/policy.js';
import { storePath } from './location.js';

export interface ProjectFlags {
  config?: string;
  /** --store FILE: the history store, overriding the config's `history`. */
  store?: string;
  policy?: string;
  cwd?: string;
}

export type Project = { ok: true; settings: ResolvedSettings; store: string; policy: GatePolicy } | { ok: false; lines: string[] };

export function resolveProject(flags: ProjectFlags): Project {
  const cwd = flags.cwd ?? process.cwd();
  let settings: ResolvedSettings;
  try {
    settings = resolveSettings({ config: flags.config, policy: flags.policy, cwd });
  } catch (error) {
    const lines = settingsErrorLines(error);
    if (lines === null) throw error;
    return { ok: false, lines };
  }
  let policy: GatePolicy;
  try {
    policy = settings.policy.value.file ? loadPolicy(settings.policy.value.file) : (settings.policy.value.inline ?? defaultPolicy());
  } catch (error) {
    if (error instanceof PolicyError) return { ok: false, lines: error.message.split('\n') };
    throw error;
  }
  return { ok: true, settings, store: storePath({ store: flags.store, config: settings.config, cwd }), policy };
}
