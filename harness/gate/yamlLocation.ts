// Where in a YAML source a JSON path points: line and column (1-based) of a key or its value,
// for error messages in the style "policy.yaml:4:3: path: problem".

import { isMap, isScalar, isSeq, LineCounter, type Document, type Node, type Pair } from 'yaml';

export interface SourcePosition {
  line: number;
  col: number;
}

function pairOf(node: unknown, segment: string): Pair<unknown, unknown> | undefined {
  if (!isMap(node)) return undefined;
  return node.items.find((pair) => (isScalar(pair.key) ? String(pair.key.value) : String(pair.key)) === segment);
}

/**
 * Position of `path` (JSON-pointer segments) in the document. `key: true` points at the key of the
 * last segment (for unknown keys) instead of its value. Falls back to the deepest node found.
 */
export function locate(
  doc: Document,
  lineCounter: LineCounter,
  path: readonly string[],
  options: { key?: boolean } = {},
): SourcePosition | undefined {
  let node: unknown = doc.contents;
  let found: Node | undefined = isScalar(node) || isMap(node) || isSeq(node) ? (node as Node) : undefined;
  for (let k = 0; k < path.length; k++) {
    const segment = path[k];
    if (isSeq(node)) {
      node = node.items[Number(segment)];
    } else {
      const pair = pairOf(node, segment);
      if (pair === undefined) break;
      if (k === path.length - 1 && options.key) {
        node = pair.key;
      } else {
        node = pair.value;
      }
    }
    if (node && typeof node === 'object' && 'range' in node) found = node as Node;
    else break;
  }
  const offset = found?.range?.[0];
  return offset === undefined ? undefined : lineCounter.linePos(offset);
}
