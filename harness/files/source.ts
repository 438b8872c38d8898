// Text → data with positions. YAML and JSON are both parsed by the `yaml` package (JSON is, for
// our purposes, a subset of YAML 1.2), so one code path yields line/column for either. The
// document is kept so a JSON pointer can be mapped back to the node it names.

import { LineCounter, isAlias, isMap, isScalar, isSeq, parseDocument, type Document } from 'yaml';
import { pointerJoin, pointerSegments, type FileIssue, type Finding } from './issue.js';
import { listLengthProblem, MAX_NESTING_DEPTH, nestingProblemInText } from './bounds.js';

export { MAX_NESTING_DEPTH };
/** Anchors/aliases beyond this are refused (guards against alias-expansion bombs). */
const MAX_ALIAS_COUNT = 100;

export interface ParsedSource {
  value: unknown;
  errors: Finding[];
  warnings: Finding[];
  /** Line/column of the node a pointer names (or of its deepest existing ancestor). */
  locate(pointer: string, at?: 'key' | 'value'): { line: number; column: number } | undefined;
  /** The source text of the scalar a pointer names (e.g. `.inf`), if any. */
  sourceText(pointer: string): string | undefined;
}

/**
 * The first place `text` is not strict JSON (RFC 8259: no trailing commas, no comments, no single
 * quotes), or null. A `.json` file is held to that: YAML would accept `[1, 2,]` and a reader of the
 * file in any other tool would not.
 */
export function strictJsonProblem(text: string): Finding | null {
  try {
    JSON.parse(text);
    return null;
  } catch (error) {
    const message = (error as Error).message;
    const at = /at position (\d+)/.exec(message);
    const offset = at ? Number(at[1]) : 0;
    let line = 1;
    let column = 1;
    for (let k = 0; k < offset && k < text.length; k++) {
      if (text[k] === '\n') {
        line++;
        column = 1;
      } else column++;
    }
    const what = message.replace(/ in JSON at position \d+.*$/, '').replace(/^Unexpected token/, 'unexpected token');
    return { path: '', message: `JSON syntax: ${what} (a .json file is read as strict JSON: no trailing commas or comments; use .yaml for those)`, line, column };
  }
}

export function parseSource(text: string, options: { json?: boolean } = {}): ParsedSource {
  const tooDeep = nestingProblemInText(text);
  if (tooDeep !== null) return { value: null, errors: [tooDeep], warnings: [], locate: () => undefined, sourceText: () => undefined };
  if (options.json) {
    const problem = strictJsonProblem(text);
    if (problem !== null) return { value: null, errors: [problem], warnings: [], locate: () => undefined, sourceText: () => undefined };
  }
  const lineCounter = new LineCounter();
  // YAMLError is an Error: capturing a stack for each of a broken file's many syntax errors costs
  // more than the parse itself, and the stacks are never shown (positions come from the parser).
  const stackTraceLimit = Error.stackTraceLimit;
  Error.stackTraceLimit = 0;
  let doc: Document.Parsed;
  try {
    doc = parseDocument(text, {
      lineCounter,
      prettyErrors: false,
      merge: true,
      uniqueKeys: true,
      strict: true,
    });
  } finally {
    Error.stackTraceLimit = stackTraceLimit;
  }
  const position = (offset: number) => {
    const p = lineCounter.linePos(offset);
    return { line: p.line, column: p.col };
  };
  const errors: Finding[] = doc.errors.map((e) => ({
    path: '',
    message: `YAML/JSON syntax: ${firstLine(e.message)}`,
    ...position(e.pos[0]),
  }));
  const warnings: Finding[] = doc.warnings.map((w) => ({
    path: '',
    message: `YAML/JSON: ${firstLine(w.message)}`,
    ...position(w.pos[0]),
  }));

  let value: unknown = null;
  if (errors.length === 0) {
    try {
      value = doc.toJS({ maxAliasCount: MAX_ALIAS_COUNT });
    } catch (e) {
      errors.push({ path: '', message: `YAML/JSON: ${firstLine((e as Error).message)}`, line: 1, column: 1 });
    }
  }

  return {
    value,
    errors,
    warnings,
    locate(pointer, at = 'value') {
      const found = positionOf(doc, lineCounter, pointerSegments(pointer), at);
      return found && { line: found.line, column: found.col };
    },
    sourceText(pointer) {
      const { node, complete } = findNode(doc, pointerSegments(pointer), 'value');
      return complete && isScalar(node) ? (node as { source?: string }).source : undefined;
    },
  };
}

/**
 * The node a path of keys names (aliases followed), or its deepest existing ancestor when the
 * path goes further than the document (`complete` false). `at: 'key'` gives the key of the last
 * segment instead of its value (for unknown fields).
 */
function findNode(doc: Document, segments: readonly string[], at: 'key' | 'value'): { node: unknown; complete: boolean } {
  let node: unknown = doc.contents;
  let keyNode: unknown = null;
  let last: unknown = node;
  for (const segment of segments) {
    if (isAlias(node)) node = node.resolve(doc);
    if (isMap(node)) {
      const pair = node.items.find((p) => keyText(p.key) === segment);
      if (!pair) return { node: last, complete: false };
      keyNode = pair.key;
      node = pair.value;
      last = node ?? keyNode;
    } else if (isSeq(node)) {
      const index = Number(segment);
      const item = Number.isInteger(index) ? node.items[index] : undefined;
      if (item === undefined) return { node: last, complete: false };
      keyNode = null;
      node = item;
      last = item;
    } else {
      return { node: last, complete: false };
    }
  }
  return { node: at === 'key' && keyNode ? keyNode : last, complete: true };
}

/**
 * Line and column (1-based) of the node a path of keys names in a parsed YAML/JSON document, for
 * messages of the form `file:line:column: path: problem`; the one locator of every file footing
 * reads (scenarios through parseSource, gate policies and configs directly).
 */
export function positionOf(doc: Document, lineCounter: LineCounter, segments: readonly string[], at: 'key' | 'value' = 'value'): { line: number; col: number } | undefined {
  const { node } = findNode(doc, segments, at);
  const range = (node as { range?: [number, number, number] } | null)?.range;
  return range ? lineCounter.linePos(range[0]) : undefined;
}

/**
 * A settings file (gate policy, project config) parsed with positions: plain YAML with unique
 * keys, its syntax errors as issues of `file` (first line of the parser's message, position
 * from the parser).
 */
export function parseSettingsYaml(text: string, file: string): { doc: Document.Parsed; lineCounter: LineCounter; issues: FileIssue[] } {
  const lineCounter = new LineCounter();
  const doc = parseDocument(text, { lineCounter, prettyErrors: true, uniqueKeys: true });
  const issues = doc.errors.map((e): FileIssue => {
    const pos = e.linePos?.[0];
    return { file, line: pos?.line, column: pos?.col, path: '', message: `YAML: ${e.message.split('\n')[0].replace(/ at line \d+, column \d+:?$/, '')}` };
  });
  return { doc, lineCounter, issues };
}

/** The value a path of keys names in parsed data (undefined past its end). */
export function valueAt(root: unknown, segments: readonly string[]): unknown {
  let value = root;
  for (const s of segments) value = value !== null && typeof value === 'object' ? (value as Record<string, unknown>)[s] : undefined;
  return value;
}

function keyText(key: unknown): string {
  if (isScalar(key)) return String(key.value);
  return String(key);
}

function firstLine(message: string): string {
  return message.split('\n')[0].trim();
}

/**
 * Walks parsed data once: refuses cycles (a YAML alias inside its own anchor), nesting deeper than
 * MAX_NESTING_DEPTH, and non-finite numbers (`.nan`, `.inf`, or literals that overflow to ∞).
 * After this every later walk may assume a finite tree.
 */
export function scanData(value: unknown, source: ParsedSource | undefined): { nonFinite: Finding[]; structural: Finding[] } {
  const nonFinite: Finding[] = [];
  const structural: Finding[] = [];
  const ancestors = new Set<object>();
  const visit = (v: unknown, pointer: string, depth: number): void => {
    if (nonFinite.length + structural.length > 200) return;
    if (typeof v === 'number' && !Number.isFinite(v)) {
      const text = source?.sourceText(pointer);
      nonFinite.push({
        path: pointer,
        message: `${text !== undefined ? `\`${text}\`` : String(v)} is not a finite number (NaN and infinities are refused; ${text !== undefined && !/nan|inf/i.test(text) ? 'the literal overflows a double; ' : ''}expected a finite number)`,
      });
      return;
    }
    if (v === null || typeof v !== 'object') return;
    if (ancestors.has(v)) {
      structural.push({ path: pointer, message: 'refers to itself through a YAML alias (recursive data is refused)' });
      return;
    }
    if (depth >= MAX_NESTING_DEPTH) {
      structural.push({ path: pointer, message: `nesting deeper than ${MAX_NESTING_DEPTH} levels is refused` });
      return;
    }
    const tooLong = Array.isArray(v) ? listLengthProblem(v, pointer) : null;
    if (tooLong !== null) {
      structural.push(tooLong);
      return;
    }
    ancestors.add(v);
    if (Array.isArray(v)) v.forEach((item, i) => visit(item, pointerJoin(pointer, i), depth + 1));
    else if (!(v instanceof Map) && !ArrayBuffer.isView(v))
      for (const [k, item] of Object.entries(v)) visit(item, pointerJoin(pointer, k), depth + 1);
    ancestors.delete(v);
  };
  visit(value, '', 0);
  return { nonFinite, structural };
}

export function isRecord(v: unknown): v is Record<string, unknown> {
  return v !== null && typeof v === 'object' && !Array.isArray(v) && !(v instanceof Map) && !ArrayBuffer.isView(v);
}
