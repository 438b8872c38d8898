// "Did you mean" for a misspelt name, the one rule for every file and flag footing reads: the
// closest known name (Levenshtein distance, case folded), offered only when it is near enough to
// be a typo — at most a third of the name's length, and at least 2 (common practice).

import { closest, distance } from 'fastest-levenshtein';

export function suggestName(name: string, known: readonly string[]): string | undefined {
  if (known.length === 0) return undefined;
  const best = closest(name, known as string[]);
  const limit = Math.max(2, Math.floor(name.length / 3));
  return distance(name.toLowerCase(), best.toLowerCase()) <= limit ? best : undefined;
}

/** `did you mean "x"?` as a hint beside a message, or undefined when no known name is near. */
export function hintFor(name: string, known: readonly string[]): string | undefined {
  const best = suggestName(name, known);
  return best === undefined ? undefined : `did you mean "${best}"?`;
}

/** `; did you mean "x"?` or, for short lists, `; known: a, b, c`; '' when neither helps. */
export function didYouMean(name: string, known: readonly string[]): string {
  const best = suggestName(name, known);
  if (best !== undefined) return `; did you mean "${best}"?`;
  if (known.length > 0 && known.length <= 12) return `; known: ${known.join(', ')}`;
  return '';
}
