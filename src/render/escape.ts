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

const CONTROL_NAMES: Record<string, string> = { "\n": "\\n", "\r": "\\r", "\t": "\\t" };

/** C0 controls (U+0000–U+001F) and DEL: characters that can end a line or hide in plain text. */
export const CONTROL_CHARACTERS = /[\u0000-\u001f\u007f]/g;

/** The visible form of one control character: \n, \r, \t, else \x followed by two hex digits. */
export function controlEscape(ch: string): string {
  return CONTROL_NAMES[ch] ?? `\\x${ch.charCodeAt(0).toString(16).padStart(2, "0")}`;
}

/**
 * Makes control characters visible as C-style escapes (newline → \n, tab → \t, ESC → \x1b),
 * so a value can never end a line or a table row. Plain ASCII on purpose: the Unicode "Control
 * Pictures" (␊) are missing from common fonts. Other text is unchanged.
 */
export function showControlCharacters(text: string): string {
  return text.replace(CONTROL_CHARACTERS, controlEscape);
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
 * shown as C-style escapes, so a value renders literally and cannot open HTML, code or links.
 */
export function escapeMarkdownText(text: string): string {
  // Escape first, then show controls: the backslash of \n must not itself be escaped, so a real
  // newline reads \n in the source and a literal backslash-n reads \\n.
  return showControlCharacters(text.replace(MARKDOWN_PUNCTUATION, (ch) => `\\${ch}`));
}

/**
 * Escapes text for a Markdown (GFM) table cell: neutralises a leading formula character
 * (see `neutraliseFormula`), then escapes like `escapeMarkdownText`, so pipes, backticks and
 * newlines cannot break the table. The empty string stays empty.
 */
export function escapeMarkdownCell(text: string): string {
  return escapeMarkdownText(neutraliseFormula(text));
}
