// "Did you mean" for a misspelt name: the closest known one, offered only when it is near enough
// to be a typo (an edit distance of at most a third of the name, and at least 2 — the limit the
// scenario loader uses too).

import { closest, distance } from 'fastest-levenshtein';

export function suggestName(name: string, known: readonly string[]): string | undefined {
  if (known.length === 0) return undefined;
  const best = closest(name, known as string[]);
  const limit = Math.max(2, Math.floor(name.length / 3));
  return distance(name.toLowerCase(), best.toLowerCase()) <= limit ? best : undefined;
}

/** `; did you mean "x"?` or, for short lists, `; known: a, b, c`; '' when neither helps. */
export function didYouMean(name: string, known: readonly string[]): string {
  const best = suggestName(name, known);
  if (best !== undefined) return `; did you mean "${best}"?`;
  if (known.length > 0 && known.length <= 12) return `; known: ${known.join(', ')}`;
  return '';
}
