/**
 * engine/timeColumns: columns whose values are dates or timestamps. They are a time axis, not a
 * set of levels, so scan does not count their levels; it keeps their exact range and granularity
 * instead, as aggregates of the one pass (no second read).
 *
 * A value reads as a time when it has one of the ISO 8601 forms `YYYY-MM-DD`,
 * `YYYY-MM-DDTHH:MM[:SS[.f…]]` or the common `YYYY-MM-DD HH:MM[:SS[.f…]]`, optionally followed by
 * `Z` or a UTC offset (`+02:00`, `-0530`), AND is a real calendar date and clock time (DuckDB's
 * TIMESTAMP cast refuses 2025-02-30 or 25:00). The offset is ignored: values are compared as the
 * clock time written, so a column mixing offsets is ordered by its local times.
 *
 * A column gets the time role when at least TIME_SHARE of its non-missing values in the first
 * SAMPLE_ROWS rows read as a time (a threshold of our own choosing: a few stray spellings such
 * as "unknown" do not turn a date column into levels); `--as-categorical` still wins.
 */
import { sqlNumber } from "./sql.js";

/** Share of non-missing sampled values that must read as a time (common practice, our choice). */
export const TIME_SHARE = 0.95;

const TIME_PART = "[0-9]{2}:[0-9]{2}(:[0-9]{2}(\\.[0-9]+)?)?";
const OFFSET = "(Z|[+-][0-9]{2}(:?[0-9]{2})?)";
const TIME_PATTERN = `^[0-9]{4}-[0-9]{2}-[0-9]{2}([T ]${TIME_PART}${OFFSET}?)?$`;

/** The TIMESTAMP a text expression reads as, or NULL when it is not one of the forms above. */
export function timeValueSql(text: string): string {
  const clock = `regexp_replace(${text}, '(${TIME_PART})${OFFSET}$', '\\1')`;
  return `(CASE WHEN regexp_full_match(${text}, '${TIME_PATTERN}') THEN try_cast(${clock} AS TIMESTAMP) END)`;
}

export type TimeGranularity = "day" | "hour" | "minute" | "second" | "sub-second";

/** The granularity flags of a time column: not a whole day / hour / minute / second. */
const FLAGS = [["d", "day"], ["h", "hour"], ["m", "minute"], ["s", "second"]] as const;

/**
 * Time column i's per-row granularity flags, from its TIMESTAMP alias `t` (NULL when `t` is
 * NULL). They are computed once per row, below the GROUP BY: an aggregate is evaluated for every
 * grouping set, so four date_trunc calls inside the aggregates cost four per row per set.
 */
export function timeFlagSql(t: string, i: number): string[] {
  return FLAGS.map(([k, unit]) => `(${t} <> date_trunc('${unit}', ${t})) AS __t${k}f${i}`);
}

/**
 * The per-fold aggregates of one time column in the pass; `t` is the column's TIMESTAMP alias and
 * its flags (timeFlagSql) are columns of the rows grouped.
 */
export function timePassAggregates(t: string, i: number): string {
  const notWhole = (name: string) => `count(*) FILTER (WHERE __t${name}f${i})::BIGINT AS __t${name}${i}`;
  return [`min(${t}) AS __tmin${i}`, `max(${t}) AS __tmax${i}`, `count(${t})::BIGINT AS __tn${i}`,
    ...FLAGS.map(([k]) => notWhole(k))].join(", ");
}

/**
 * Time column i's totals (the columns timeTotalsSql gives) from distinct values instead of rows:
 * `value` is a value's TIMESTAMP, `rows` how many rows hold it (engine/keyedExtras). The same
 * flags as timeFlagSql, each weighted by its rows.
 */
export function timeTotalsFromValuesSql(value: string, rows: string, i: number): string {
  const n = sqlNumber(i);
  return [`min(${value})::VARCHAR AS tmin${n}`, `max(${value})::VARCHAR AS tmax${n}`,
    `coalesce(sum(${rows}) FILTER (WHERE ${value} IS NOT NULL), 0)::DOUBLE AS tn${n}`,
    ...FLAGS.map(([k, unit]) => `coalesce(sum(${rows}) FILTER (WHERE ${value} <> date_trunc('${unit}', ${value})), 0)::DOUBLE AS t${k}${n}`)].join(", ");
}

/** The same aggregates summed over the per-fold total rows (col = -1) of the level table. */
export function timeTotalsSql(i: number): string {
  const n = sqlNumber(i);
  return [`min(__tmin${n})::VARCHAR AS tmin${n}`, `max(__tmax${n})::VARCHAR AS tmax${n}`,
    ...["n", "d", "h", "m", "s"].map((k) => `sum(__t${k}${n})::DOUBLE AS t${k}${n}`)].join(", ");
}

export interface TimeTotals {
  /** Earliest and latest value, `YYYY-MM-DD HH:MM:SS[.f]` (exact: from every row). */
  min: string | null;
  max: string | null;
  /** Non-missing values that read as a time. */
  parsed: number;
  /** Values with a time of day other than midnight / minutes / seconds / fractions of a second. */
  offDay: number;
  offHour: number;
  offMinute: number;
  offSecond: number;
}

/** Reads one column's totals from a row of timeTotalsSql columns. */
export function readTimeTotals(row: Record<string, unknown>, i: number): TimeTotals {
  const num = (k: string) => Number(row[`t${k}${i}`] ?? 0);
  const text = (k: string) => (typeof row[k] === "string" ? (row[k] as string) : null);
  return { min: text(`tmin${i}`), max: text(`tmax${i}`), parsed: num("n"), offDay: num("d"), offHour: num("h"), offMinute: num("m"), offSecond: num("s") };
}

/** The finest unit the values use: day when every value is at midnight, and so on. */
export function timeGranularity(t: TimeTotals): TimeGranularity {
  if (t.offSecond > 0) return "sub-second";
  if (t.offMinute > 0) return "second";
  if (t.offHour > 0) return "minute";
  if (t.offDay > 0) return "hour";
  return "day";
}

const DAY_MS = 86_400_000;

/**
 * Calendar parts worth deriving (common practice): the hour when values carry a time of day, the
 * day of week when the range spans at least two weeks, the month when it spans at least two
 * months (60 days), the year when it spans at least two years.
 */
export function calendarParts(t: TimeTotals): string[] {
  if (t.min === null || t.max === null) return [];
  const span = (Date.parse(`${t.max.replace(" ", "T")}Z`) - Date.parse(`${t.min.replace(" ", "T")}Z`)) / DAY_MS;
  const parts: string[] = [];
  if (timeGranularity(t) !== "day") parts.push("hour");
  if (span >= 14) parts.push("day of week");
  if (span >= 60) parts.push("month");
  if (span >= 730) parts.push("year");
  return parts;
}

/** A bound as the record shows it: the date alone at day granularity. */
export function formatTimeBound(value: string | null, granularity: TimeGranularity): string | null {
  if (value === null) return null;
  return granularity === "day" ? value.slice(0, 10) : value;
}
