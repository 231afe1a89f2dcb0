/**
 * encode/cellGuard: spreadsheet formula neutralisation of encode's CSV/TSV output. A spreadsheet
 * opening the file runs a cell that starts with `=`, `+`, `-` or `@` as a formula (and a leading
 * tab or carriage return can hide such a start), so a level value like `=HYPERLINK("http://x")`
 * written raw is an injection. Such text cells — data and header alike — get a single quote
 * `'` in front: the spreadsheet then shows the text as text, and the prefix is one visible
 * character a reader can strip. This is common practice (OWASP, "CSV Injection": prepend a
 * single quote to cells starting with these characters); no standard defines it.
 * Numbers stay plain: a cell that is a plain number (`-5`, `-0.25`, `1e-3`) is not a formula and
 * is never prefixed, and encoded (numeric) columns are never touched. Parquet output is typed
 * and is not changed. `--no-cell-guard` turns the prefix off for machine-only pipelines.
 */
import { quoteLiteral } from "../engine/sql.js";
import { PLAIN_NUMBER_RE } from "../engine/inspect.js";

/** The prefix put before a cell a spreadsheet would run. */
export const CELL_GUARD_PREFIX = "'";

/** Characters that make a spreadsheet read a cell as a formula when they come first. */
export const FORMULA_STARTS = ["=", "+", "-", "@", "\t", "\r"];

const PLAIN = new RegExp(PLAIN_NUMBER_RE);

/** True when a spreadsheet would run `text` as a formula (and it is not a plain number). */
export function isFormulaLike(text: string): boolean {
  return FORMULA_STARTS.some((c) => text.startsWith(c)) && !PLAIN.test(text);
}

/** A header cell as written: prefixed when formula-like. */
export const guardHeader = (name: string): string => (isFormulaLike(name) ? `${CELL_GUARD_PREFIX}${name}` : name);

/** SQL for a VARCHAR expression with the guard applied (NULL stays NULL). */
export function guardCellSql(expr: string): string {
  const starts = "'=', '+', '-', '@', chr(9), chr(13)"; // FORMULA_STARTS
  return `(CASE WHEN left(${expr}, 1) IN (${starts}) AND NOT regexp_full_match(${expr}, ${quoteLiteral(PLAIN_NUMBER_RE)}) THEN ${quoteLiteral(CELL_GUARD_PREFIX)} || ${expr} ELSE ${expr} END)`;
}
