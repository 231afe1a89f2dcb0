/**
 * engine/csvDialect: DuckDB's CSV layout detection (its "sniffer": delimiter, quote, escape, line
 * ending, comment, leading rows to skip), run once per input instead of once per statement.
 *
 * Every statement that reads `read_csv(...)` without these options detects them again, and on
 * wide files that dominates (bench/README.md: `SELECT count(*)` over 1,500 columns × 10k rows
 * took 11.3 s detecting and 2.6 s with the layout given). engine/source asks `sniff_csv` — the
 * same detection, with the same options — for each file, and when all files agree it names the
 * detected layout in the view, so DuckDB reads exactly as it would have, without detecting.
 * When a file cannot be sniffed or the files differ, nothing is pinned: each read detects as
 * before, and reports any error as before.
 */
import { isTailsiftError } from "../errors.js";
import type { Engine } from "./db.js";
import { quoteLiteral } from "./sql.js";

/** The layout DuckDB detected, as read_csv option values ('' = none). */
export interface CsvDialect {
  delim: string;
  quote: string;
  escape: string;
  /** '\n', '\r\n' or '\r', spelled with backslashes as read_csv's new_line takes them. */
  newLine: string;
  comment: string;
  /** Lines before the header that DuckDB skips. */
  skip: number;
}

/** Files sniffed in one statement (a UNION ALL of sniff_csv calls). */
const SNIFF_BATCH = 100;
const NEW_LINES = new Set(["\\n", "\\r\\n", "\\r"]);

interface SniffRow { Delimiter: string; Quote: string; Escape: string; NewLineDelimiter: string; Comment: string; SkipRows: number }

/** sniff_csv spells "none" as "(empty)". */
const orNone = (v: string) => (v === "(empty)" ? "" : v);

/** The dialect of one sniff_csv row; null when a value is not one read_csv can be given back. */
function dialectOf(row: SniffRow): CsvDialect | null {
  const d: CsvDialect = {
    delim: orNone(String(row.Delimiter)), quote: orNone(String(row.Quote)), escape: orNone(String(row.Escape)),
    newLine: String(row.NewLineDelimiter), comment: orNone(String(row.Comment)), skip: Number(row.SkipRows),
  };
  if (d.delim === "" || !NEW_LINES.has(d.newLine) || !Number.isInteger(d.skip) || d.skip < 0) return null;
  return d;
}

const sameDialect = (a: CsvDialect, b: CsvDialect) =>
  a.delim === b.delim && a.quote === b.quote && a.escape === b.escape && a.newLine === b.newLine && a.comment === b.comment && a.skip === b.skip;

/**
 * The layout shared by every file of `files`, detected by DuckDB with `options` (read_csv options
 * without the file list, exactly those of the reads the layout will be pinned in). Null when a
 * file cannot be sniffed (the reads then detect, and fail, as they always did) or when the files'
 * layouts differ (each file is then detected on its own, as before). Interrupts pass through.
 */
export async function sniffDialect(engine: Engine, files: readonly string[], options: readonly string[]): Promise<CsvDialect | null> {
  let shared: CsvDialect | null = null;
  for (let i = 0; i < files.length; i += SNIFF_BATCH) {
    const sql = files.slice(i, i + SNIFF_BATCH).map((file) =>
      `SELECT Delimiter, Quote, Escape, NewLineDelimiter, Comment, SkipRows FROM sniff_csv(${[quoteLiteral(file), ...options].join(", ")})`).join(" UNION ALL ");
    let rows: SniffRow[];
    try {
      rows = await engine.rows<SniffRow>(sql, "detecting the CSV layout");
    } catch (err) {
      if (isTailsiftError(err) && err.code === "interrupted") throw err;
      return null;
    }
    for (const row of rows) {
      const d = dialectOf(row);
      if (d === null || (shared !== null && !sameDialect(shared, d))) return null;
      shared = d;
    }
  }
  return shared;
}

/**
 * read_csv options that pin `d`, so DuckDB skips its detection; `delimiter` (the user's
 * --delimiter, or tab for .tsv) wins over the detected one.
 */
export function dialectOptions(d: CsvDialect, delimiter?: string): string[] {
  return [`delim = ${quoteLiteral(delimiter ?? d.delim)}`, `quote = ${quoteLiteral(d.quote)}`, `escape = ${quoteLiteral(d.escape)}`,
    `new_line = ${quoteLiteral(d.newLine)}`, `comment = ${quoteLiteral(d.comment)}`, `skip = ${d.skip}`];
}
