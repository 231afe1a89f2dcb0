/**
 * engine/inspect: a bounded look at the first rows (LIMIT, so the reader stops early) to decide
 * which columns look numeric or like dates/times and what kind of target we have. Every decision
 * made here is checked exactly in the full pass (values that do not fit the detected target kind
 * are counted there; time columns get their exact range there; numeric identifier candidates
 * get an exact distinct count there).
 *
 * Numeric identifiers (a unique integer per row, such as a row key): counting the distinct values
 * of every numeric column exactly would cost a level table per column. The sample screens
 * instead: only a column whose sampled values are all integers and at least
 * NUMERIC_IDENTIFIER_SHARE of them distinct is counted exactly in the pass (one GROUP BY set
 * without folds, the size of a text identifier's level table); so are numeric columns with at
 * most NUMERIC_FEW_VALUES sampled values (a few groups, nearly free), so the record can state
 * exactly how many values they have. Every other numeric column reports its sampled count.
 */
import type { Engine } from "./db.js";
import { quoteIdent } from "./sql.js";
import { TIME_SHARE, timeValueSql } from "./timeColumns.js";
import { sampleCountsUnnested } from "./wideSample.js";

export const SAMPLE_ROWS = 50_000;
/**
 * Numeric columns with at most this many sampled values get an exact distinct count. (Before,
 * such columns were profiled as levels; small counts now stay numbers unless --as-categorical.)
 */
export const NUMERIC_FEW_VALUES = 20;
/** An integer column with distinct values on at least this share of its non-missing rows is an identifier (our choice: "one value per row", allowing a few repeats). */
export const NUMERIC_IDENTIFIER_SHARE = 0.99;
/** Fewest non-missing rows before a numeric column can be called an identifier (a handful of distinct numbers is not a key). */
export const NUMERIC_IDENTIFIER_MIN_ROWS = 100;

/** A plain number as the sample accepts it (no sign other than '-', no leading zeros, no spaces). */
export const PLAIN_NUMBER_RE = "^-?(0|[1-9][0-9]*)(\\.[0-9]+)?([eE][-+]?[0-9]+)?$";
const NUMBER_RE = PLAIN_NUMBER_RE;
/**
 * A plain integer of at most 18 digits (always fits a signed 64-bit integer). One count serves both
 * the numeric-identifier screen and encode's output type (numberTypeOf); a longer run of digits is
 * not counted as an integer, so such a column is neither screened as an identifier nor written as BIGINT.
 */
const INTEGER_RE = "^-?(0|[1-9][0-9]{0,17})$";

export interface ColumnSample {
  name: string;
  nonMissing: number;
  numberLike: number;
  /** Sampled values that are plain integers (of at most 18 digits). */
  integerLike: number;
  distinct: number;
  /** Sampled values that read as a date or timestamp (engine/timeColumns). */
  timeLike?: number;
  /** Rows sampled (at most SAMPLE_ROWS). */
  sampledRows?: number;
}

/** Per-column counts over the first SAMPLE_ROWS rows. */
export async function sampleColumns(engine: Engine, view: string, columns: readonly string[]): Promise<ColumnSample[]> {
  // wide inputs: one unnested query reads the first rows once (engine/wideSample); same counts
  if (columns.length > SAMPLE_BATCH) {
    const counts = await sampleCountsUnnested(engine, view, columns, SAMPLE_ROWS, { number: NUMBER_RE, integer: INTEGER_RE, time: timeValueSql });
    return columns.map((name, i) => ({ name, ...counts[i]! }));
  }
  const out: ColumnSample[] = [];
  // in batches: one query per SAMPLE_BATCH columns keeps memory bounded on very wide inputs
  for (let start = 0; start < columns.length; start += SAMPLE_BATCH) {
    out.push(...(await sampleBatch(engine, view, columns.slice(start, start + SAMPLE_BATCH))));
  }
  return out;
}

const SAMPLE_BATCH = 200;

async function sampleBatch(engine: Engine, view: string, columns: readonly string[]): Promise<ColumnSample[]> {
  const parts = columns.map((c, i) => {
    const q = quoteIdent(c);
    return `count(${q}) AS n${i}, count(*) FILTER (WHERE regexp_full_match(${q}, '${NUMBER_RE}')) AS k${i}, count(DISTINCT ${q}) AS d${i}`
      + `, count(*) FILTER (WHERE regexp_full_match(${q}, '${INTEGER_RE}')) AS i${i}, count(${timeValueSql(q)}) AS t${i}`;
  });
  const [row] = await engine.rows<Record<string, number>>(
    `SELECT count(*) AS __rows, ${parts.join(", ")} FROM (SELECT * FROM ${view} LIMIT ${SAMPLE_ROWS})`, "sampling the first rows");
  return columns.map((name, i) => ({
    name,
    nonMissing: row?.[`n${i}`] ?? 0,
    numberLike: row?.[`k${i}`] ?? 0,
    distinct: row?.[`d${i}`] ?? 0,
    integerLike: row?.[`i${i}`] ?? 0,
    timeLike: row?.[`t${i}`] ?? 0,
    sampledRows: row?.__rows ?? 0,
  }));
}

/** True when a sampled column reads as a measurement rather than a code: every value a plain number (however few values it has). */
export function looksNumeric(sample: ColumnSample): boolean {
  return sample.nonMissing > 0 && sample.numberLike === sample.nonMissing;
}

/** True when at least TIME_SHARE of the sampled non-missing values read as dates or timestamps. */
export function looksTime(sample: ColumnSample): boolean {
  return sample.nonMissing > 0 && (sample.timeLike ?? 0) >= TIME_SHARE * sample.nonMissing;
}

/** A numeric column whose exact distinct count the pass should take (see the module comment). */
export function needsExactDistinct(sample: ColumnSample): boolean {
  return sample.distinct <= NUMERIC_FEW_VALUES || screensAsIdentifier(sample);
}

/** Sampled values all integers, nearly all distinct: a numeric identifier candidate. */
export function screensAsIdentifier(sample: ColumnSample): boolean {
  return sample.nonMissing > 0 && sample.integerLike === sample.nonMissing && sample.distinct >= NUMERIC_IDENTIFIER_SHARE * sample.nonMissing;
}

/** The type encode writes a numeric column as: integer when every sampled value is an integer. */
export function numberTypeOf(sample: ColumnSample): "integer" | "double" {
  return sample.integerLike === sample.nonMissing ? "integer" : "double";
}

/** Distinct non-empty target values in the sample, lower-cased and trimmed, at most `limit`. */
export async function sampleTargetValues(engine: Engine, view: string, column: string, limit = 50): Promise<string[]> {
  const q = quoteIdent(column);
  const rows = await engine.rows<{ v: string }>(
    `SELECT DISTINCT trim(${q}) AS v FROM (SELECT ${q} FROM ${view} LIMIT ${SAMPLE_ROWS}) WHERE ${q} IS NOT NULL AND trim(${q}) <> '' ORDER BY v LIMIT ${limit}`,
    `sampling target '${column}'`);
  return rows.map((r) => r.v);
}
