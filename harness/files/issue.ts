// Problems found in a file footing reads (scenario, robot, CSV series, gate policy, config,
// results), and how they are printed. A Finding is what a check produces (a JSON pointer and a
// message); a loader turns it into a FileIssue, the one issue type, by adding the file name and
// the line/column of the node the pointer names.

export interface FileIssue {
  /** File the problem is in, relative to the working directory when inside it. */
  file: string;
  /** 1-based line and column of the offending node (absent when no position is known). */
  line?: number;
  column?: number;
  /** JSON pointer into the file's data, e.g. /ground/patches/1/material/staticFriction ('' = the whole file). */
  path: string;
  message: string;
  /** A suggestion such as `did you mean "stribeckVelocity_mps"?`. */
  hint?: string;
}

/** What a check reports before the loader knows positions. */
export interface Finding {
  path: string;
  message: string;
  hint?: string;
  /** Point at the key of the last path segment instead of its value (unknown fields). */
  at?: 'key' | 'value';
  /** Set when the problem is in another file (CSV rows, a referenced robot file). */
  file?: string;
  line?: number;
  column?: number;
}

/** `file:line:column /path: message (hint)`, the one line shown to people. */
export function formatIssue(issue: FileIssue): string {
  const where =
    issue.line !== undefined ? `${issue.file}:${issue.line}:${issue.column ?? 1}` : issue.file;
  const hint = issue.hint ? ` (${issue.hint})` : '';
  return `${where} ${issue.path === '' ? '/' : issue.path}: ${issue.message}${hint}`;
}

/** Escape one JSON pointer segment (RFC 6901). */
export function pointerSegment(key: string | number): string {
  return String(key).replace(/~/g, '~0').replace(/\//g, '~1');
}

export function pointerJoin(base: string, ...keys: (string | number)[]): string {
  return base + keys.map((k) => '/' + pointerSegment(k)).join('');
}

export function pointerSegments(pointer: string): string[] {
  if (pointer === '') return [];
  return pointer
    .slice(1)
    .split('/')
    .map((s) => s.replace(/~1/g, '/').replace(/~0/g, '~'));
}

/** A value as it appears in messages: short, unambiguous. */
export function showValue(value: unknown): string {
  if (typeof value === 'number') return Number.isFinite(value) ? String(value) : String(value);
  if (typeof value === 'string') return JSON.stringify(value.length > 40 ? value.slice(0, 37) + '...' : value);
  if (value === null) return 'null';
  if (value === undefined) return 'nothing';
  let text: string;
  try {
    text = JSON.stringify(value) ?? String(value);
  } catch {
    text = Array.isArray(value) ? '[...]' : '{...}';
  }
  return text.length > 40 ? text.slice(0, 37) + '...' : text;
}

export function kindOf(value: unknown): string {
  if (value === null) return 'null';
  if (Array.isArray(value)) return 'a list';
  if (typeof value === 'object') return 'a mapping';
  if (typeof value === 'number') return Number.isInteger(value) ? 'an integer' : 'a number';
  return `a ${typeof value}`;
}
