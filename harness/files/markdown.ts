// Text from builds and result files (error messages, stderr, reasons, names) placed into the
// Markdown we write for merge-request comments (gate.md, summary.md). Rendered raw, such text could
// forge a heading ("### ✅ hold"), show a remote image, notify people with @-mentions, or break a
// table. Here it becomes one inert line: line breaks become spaces, Markdown punctuation is
// backslash-escaped (CommonMark §2.4: any ASCII punctuation may be escaped; an escaped `<` opens
// no raw HTML, an escaped `&` no entity), and `@` is followed by a zero-width joiner so no mention is formed.

/**
 * ASCII punctuation that shapes Markdown inline: links and images need `[`/`]`, emphasis `*`/`_`,
 * code spans a backtick, tables `|`, strikethrough `~`, raw HTML `<`, entities `&`. Line-start syntax (`#`, `-`, `1.`) cannot
 * arise once line breaks are gone, but `#` is escaped anyway as it costs nothing.
 */
const MARKDOWN_PUNCTUATION = /[\\`*_[\]#!|~<>&]/g;

export function markdownInline(text: string): string {
  return text
    .replace(/\r\n?|\n|\u2028|\u2029/g, ' ')
    .replace(/[\u0000-\u001F\u007F]/g, ' ')
    .replace(MARKDOWN_PUNCTUATION, (ch) => `\\${ch}`)
    .replace(/@/g, '@\u200D');
}

/** A name (scenario id, build) as a code span: backticks and line breaks cannot end it early. */
export function markdownCode(text: string): string {
  const inner = text.replace(/[`\r\n\u2028\u2029]/g, "'").replace(/[\u0000-\u001F\u007F]/g, ' ');
  // An empty or all-space span is not a code span in CommonMark (§6.1).
  return inner.trim() === '' ? '(unnamed)' : `\`${inner}\``;
}
