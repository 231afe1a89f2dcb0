/**
 * engine/inspect: a bounded look at the first rows (LIMIT, so the reader stops early) to decide
 * which columns look numeric and what kind of target we have. Every decision made here is checked
 * exactly in the full pass (values that do not fit the detected target kind are counted there).
 */
import type { Engine } from "./db.js";
import { quoteIdent } from "./sql.js";
import { sampleCountsUnnested } from "./wideSample.js";

export const SAMPLE_ROWS = 50_000;
/** A column is numeric when every sampled value is a plain number (no leading zeros) and it has more than this many distinct values. */
export const NUMERIC_MIN_DISTINCT = 20;

/** A plain number as the sample accepts it (no sign other than '-', no leading zeros, no spaces). */
export const PLAIN_NUMBER_RE = "^-?(0|[1-9][0-9]*)(\\.[0-9]+)?([eE][-+]?[0-9]+)?$";
const NUMBER_RE = PLAIN_NUMBER_RE;
/** A plain integer of at most 18 digits (always fits a signed 64-bit integer). */
const INTEGER_RE = "^-?(0|[1-9][0-9]{0,17})$";

export interface ColumnSample {
  name: string;
  nonMissing: number;
  numberLike: number;
  /** Sampled values that are plain integers (of at most 18 digits). */
  integerLike: number;
  distinct: number;
}

/** Per-column counts over the first SAMPLE_ROWS rows. */
export async function sampleColumns(engine: Engine, view: string, columns: readonly string[]): Promise<ColumnSample[]> {
  // wide inputs: one unnested query reads the first rows once (engine/wideSample); same counts
  if (columns.length > SAMPLE_BATCH) {
    const counts = await sampleCountsUnnested(engine, view, columns, SAMPLE_ROWS, NUMBER_RE, INTEGER_RE);
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
    return `count(${q}) AS n${i}, count(*) FILTER (WHERE regexp_full_match(${q}, '${NUMBER_RE}')) AS k${i}, count(*) FILTER (WHERE regexp_full_match(${q}, '${INTEGER_RE}')) AS j${i}, count(DISTINCT ${q}) AS d${i}`;
  });
  const [row] = await engine.rows<Record<string, number>>(
    `SELECT ${parts.join(", ")} FROM (SELECT * FROM ${view} LIMIT ${SAMPLE_ROWS})`, "sampling the first rows");
  return columns.map((name, i) => ({
    name,
    nonMissing: row?.[`n${i}`] ?? 0,
    numberLike: row?.[`k${i}`] ?? 0,
    integerLike: row?.[`j${i}`] ?? 0,
    distinct: row?.[`d${i}`] ?? 0,
  }));
}

/** True when a sampled column reads as a measurement rather than a code. */
export function looksNumeric(sample: ColumnSample): boolean {
  return sample.nonMissing > 0 && sample.numberLike === sample.nonMissing && sample.distinct > NUMERIC_MIN_DISTINCT;
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
