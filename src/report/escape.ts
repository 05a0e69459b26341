// Every string that comes from a results file (ids, titles, sources, messages, method names) is
// user data: it goes through here before it reaches HTML or Markdown.

const HTML: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' };

/** Safe in element text and in double- or single-quoted attribute values. */
export function escapeHtml(s: string): string {
  return String(s).replace(/[&<>"']/g, (c) => HTML[c]!);
}

/**
 * Safe as Markdown inline text and inside a table cell: `&`, `<` and `>` HTML-escaped (renderers
 * pass raw HTML through, and no tag can open without `<`; quotes stay readable in the raw file),
 * emphasis, code, link brackets, strike and table pipes backslash-escaped (a link cannot open
 * without `[`), line breaks folded so a cell stays one row.
 */
export function escapeMarkdown(s: string): string {
  return String(s)
    .replace(/[&<>]/g, (c) => HTML[c]!)
    .replace(/[\\`*_[\]|~]/g, (c) => `\\${c}`)
    .replace(/\r?\n|\r/g, ' ');
}
