// Scenario globs of a suite: `*` (any run of characters within one path segment), `?` (one
// character), `**` (any number of whole segments). Matching walks from the pattern's fixed leading
// folders; hidden entries and node_modules are skipped, as the scenario loader skips them.

import { readdirSync } from 'node:fs';
import path from 'node:path';

export function isGlob(pattern: string): boolean {
  return /[*?]/.test(pattern);
}

/** The regular expression of a glob over '/'-separated relative paths. */
export function globToRegExp(pattern: string): RegExp {
  let source = '';
  for (let i = 0; i < pattern.length; i++) {
    const c = pattern[i];
    if (c === '*' && pattern[i + 1] === '*') {
      // `**/` matches zero or more whole folders; a trailing `**` matches everything below.
      if (pattern[i + 2] === '/') {
        source += '(?:[^/]+/)*';
        i += 2;
      } else {
        source += '.*';
        i += 1;
      }
    } else if (c === '*') source += '[^/]*';
    else if (c === '?') source += '[^/]';
    else source += c.replace(/[.+^${}()|[\]\\]/g, '\\$&');
  }
  return new RegExp(`^${source}$`);
}

/** Files matching `pattern` (relative to `base`, or absolute), sorted; [] when none. */
export function expandGlob(pattern: string, base: string): string[] {
  const normalised = pattern.split(path.sep).join('/');
  const segments = normalised.split('/');
  const fixed: string[] = [];
  for (const segment of segments) {
    if (isGlob(segment)) break;
    fixed.push(segment);
  }
  const root = path.resolve(base, fixed.join('/') || '.');
  const rest = segments.slice(fixed.length).join('/');
  const matcher = globToRegExp(rest);
  const found: string[] = [];
  const walk = (folder: string, relative: string) => {
    let entries;
    try {
      entries = readdirSync(folder, { withFileTypes: true });
    } catch {
      return;
    }
    for (const entry of entries) {
      if (entry.name.startsWith('.') || entry.name === 'node_modules') continue;
      const rel = relative === '' ? entry.name : `${relative}/${entry.name}`;
      const full = path.join(folder, entry.name);
      if (entry.isDirectory()) walk(full, rel);
      else if (entry.isFile() && matcher.test(rel)) found.push(full);
    }
  };
  walk(root, '');
  return found.sort();
}
