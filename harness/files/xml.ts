// Text that XML 1.0 can hold. The XML builder escapes &, <, > and quotes, but a control character
// (an ANSI colour escape in a build's stderr, say) or a lone UTF-16 surrogate is not allowed in an
// XML 1.0 document at all, escaped or not (XML 1.0 §2.2, production [2] Char), and strict parsers
// refuse the whole junit.xml. Such characters are written as visible text instead (`\x1B`,
// `\uD800`), so the information survives and the file parses.

/** Matches every UTF-16 code unit sequence outside XML 1.0's Char production. */
const NOT_XML_CHAR = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\uFFFE\uFFFF]|[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/g;

export function xmlSafeText(text: string): string {
  return text.replace(NOT_XML_CHAR, (ch) => {
    const code = ch.charCodeAt(0);
    return code < 0x100 ? `\\x${code.toString(16).toUpperCase().padStart(2, '0')}` : `\\u${code.toString(16).toUpperCase().padStart(4, '0')}`;
  });
}

/** A copy of a document tree (plain objects, arrays, strings) with every string made XML-safe. */
export function xmlSafeTree<T>(node: T): T {
  if (typeof node === 'string') return xmlSafeText(node) as T;
  if (Array.isArray(node)) return node.map(xmlSafeTree) as T;
  if (node !== null && typeof node === 'object') {
    const out: Record<string, unknown> = {};
    for (const [key, value] of Object.entries(node)) out[xmlSafeText(key)] = xmlSafeTree(value);
    return out as T;
  }
  return node;
}
