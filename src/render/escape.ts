/**
 * Escaping for text that comes from the data (level values, column names, file paths) before it
 * is placed in HTML, Markdown or a cell a spreadsheet may open. Renderers escape every such
 * string; nothing from the data is trusted to be plain text.
 */

const HTML_ENTITIES: Record<string, string> = {
  "&": "&amp;",
  "<": "&lt;",
  ">": "&gt;",
  '"': "&quot;",
  "'": "&#39;",
};

/**
 * Escapes text for HTML element content and double- or single-quoted attribute values:
 * & < > " ' become entities (OWASP Cross Site Scripting Prevention Cheat Sheet, "Output
 * Encoding for HTML Contexts"). The empty string stays empty.
 */
export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (ch) => HTML_ENTITIES[ch] ?? ch);
}

/** Characters that make a spreadsheet treat a cell as a formula. */
const FORMULA_START = /^[=+\-@\t\r]/;

/**
 * Neutralises spreadsheet formulas in an exported cell: a cell that starts with = + - @, a tab
 * or a carriage return gets a leading apostrophe, so Excel, LibreOffice and Google Sheets show
 * it as text instead of evaluating it. Source: OWASP, "CSV Injection" (owasp.org/www-community/
 * attacks/CSV_Injection), which lists these leading characters and this mitigation. Other cells,
 * including the empty string, are returned unchanged.
 */
export function neutraliseFormula(cell: string): string {
  return FORMULA_START.test(cell) ? `'${cell}` : cell;
}

/**
 * Makes control characters visible: C0 controls (tab, newline, …) become their Unicode
 * "Control Pictures" (U+2400 + code, e.g. newline → ␊) and DEL becomes ␡, so a value can never
 * end a line or a table row.
 */
export function showControlCharacters(text: string): string {
  return text.replace(/[\u0000-\u001f\u007f]/g, (ch) => {
    const code = ch.charCodeAt(0);
    return String.fromCharCode(code === 0x7f ? 0x2421 : 0x2400 + code);
  });
}

/**
 * ASCII punctuation that CommonMark/GFM reads as markup anywhere in a line: escapes, code,
 * emphasis, links/images, raw HTML, entities, table cells, strikethrough, heading closers.
 * Characters that matter only at the start of a line (- + . digits) are not escaped: renderers
 * always put data text after a prefix of their own.
 */
const MARKDOWN_PUNCTUATION = /[\\`*_[\]<>|&#~]/g;

/**
 * Escapes text for Markdown prose and headings (CommonMark backslash escapes, spec section 2.4):
 * markup punctuation, including | and backticks, is backslash-escaped and control characters are
 * shown as symbols, so a value renders literally and cannot open HTML, code or links.
 */
export function escapeMarkdownText(text: string): string {
  return showControlCharacters(text).replace(MARKDOWN_PUNCTUATION, (ch) => `\\${ch}`);
}

/**
 * Escapes text for a Markdown (GFM) table cell: neutralises a leading formula character
 * (see `neutraliseFormula`), then escapes like `escapeMarkdownText`, so pipes, backticks and
 * newlines cannot break the table. The empty string stays empty.
 */
export function escapeMarkdownCell(text: string): string {
  return escapeMarkdownText(neutraliseFormula(text));
}
