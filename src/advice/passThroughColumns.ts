/**
 * advice/passThroughColumns: the record of columns scan does not count as levels — numbers and
 * times — and the decision for each:
 * - numeric: passed through unchanged (`keep`), however few values it has (a count of 0–5 is a
 *   number, not five categories); `--as-categorical` profiles it as levels instead. The record
 *   says how many values it has (exact when counted in the pass, else over the sample).
 * - identifier (numeric): an integer column with a distinct value on at least 99 % of its
 *   non-missing rows, counted exactly in the pass, is a row key: `drop` (it cannot generalise and
 *   usually just orders rows in time). `encode --keep COL` still passes it through.
 * - time: passed through unchanged (`keep`) rather than dropped: it is the time axis of a
 *   time-ordered validation, and calendar parts can be derived from it; it is never encoded as
 *   levels.
 */
import { NUMERIC_IDENTIFIER_MIN_ROWS, NUMERIC_IDENTIFIER_SHARE, SAMPLE_ROWS, type ColumnSample } from "../engine/inspect.js";
import type { PassTotals } from "../engine/aggregate.js";
import { calendarParts, formatTimeBound, timeGranularity, TIME_SHARE, type TimeTotals } from "../engine/timeColumns.js";
import { unmeasuredColumn } from "../profile/columnFigures.js";
import type { ColumnProfile } from "../profile/types.js";
import { count, pct } from "./words.js";

export interface PassThroughFacts {
  rows: number;
  /** Non-missing rows (exact, from the pass). */
  nonMissing: number;
  sample?: ColumnSample;
  /** Exact distinct count from the pass, when the column was counted. */
  exact?: { distinct: number; maxRows: number };
  time?: TimeTotals;
}

const sampleWords = (s: ColumnSample | undefined) => `the first ${count(Math.min(s?.sampledRows ?? SAMPLE_ROWS, SAMPLE_ROWS))} rows`;

/** The profile of a numeric column: numeric and kept, or a numeric identifier and dropped. */
export function numericColumnProfile(name: string, f: PassThroughFacts): ColumnProfile {
  const missing = f.rows - f.nonMissing;
  const integer = f.sample !== undefined && f.sample.integerLike === f.sample.nonMissing;
  const values = f.exact
    ? { distinct: f.exact.distinct, exact: true, integer, maxRows: f.exact.maxRows }
    : { distinct: f.sample?.distinct ?? 0, exact: false, integer, ...(f.sample?.sampledRows !== undefined ? { sampledRows: f.sample.sampledRows } : {}) };
  const share = f.nonMissing > 0 ? values.distinct / f.nonMissing : 0;
  if (f.exact && integer && f.nonMissing >= NUMERIC_IDENTIFIER_MIN_ROWS && share >= NUMERIC_IDENTIFIER_SHARE) {
    const column = unmeasuredColumn(name, "identifier", f.rows, missing,
      `Drop: a numeric identifier — ${count(values.distinct)} distinct integers in ${count(f.nonMissing)} non-missing rows (${pct(share)}, at least ${pct(NUMERIC_IDENTIFIER_SHARE)} counts as one value per row; the most repeated value is on ${count(f.exact.maxRows)} row${f.exact.maxRows === 1 ? "" : "s"}). A row key carries no information a model can reuse on new rows (and usually just orders rows in time); encode --keep ${name} passes it through.`);
    return { ...column, recommendation: { encoding: "drop", params: { role: "identifier" }, reasons: column.recommendation.reasons }, numericValues: values };
  }
  const how = values.exact ? `${count(values.distinct)} distinct value${values.distinct === 1 ? "" : "s"} (exact)` : `${count(values.distinct)} distinct values in ${sampleWords(f.sample)}`;
  const column = unmeasuredColumn(name, "numeric", f.rows, missing,
    `Numeric: every sampled value is a number; ${how}. Passed through unchanged as a number, however few values it has (use --as-categorical ${name} to profile it as levels).`);
  return { ...column, numericValues: values };
}

/** The profile of a time column: kept as the time axis, with its range, granularity and calendar parts. */
export function timeColumnProfile(name: string, f: PassThroughFacts): ColumnProfile {
  const missing = f.rows - f.nonMissing;
  const t = f.time ?? { min: null, max: null, parsed: 0, offDay: 0, offHour: 0, offMinute: 0, offSecond: 0 };
  const granularity = timeGranularity(t);
  const parts = calendarParts(t);
  const sampled = f.sample && f.sample.nonMissing > 0 ? (f.sample.timeLike ?? 0) / f.sample.nonMissing : 0;
  const unparsed = Math.max(0, f.nonMissing - t.parsed);
  const min = formatTimeBound(t.min, granularity);
  const max = formatTimeBound(t.max, granularity);
  const reasons = [
    `Time: ${pct(sampled)} of the non-missing values in ${sampleWords(f.sample)} read as dates or timestamps (YYYY-MM-DD, optionally with THH:MM[:SS] or a space before the time; at least ${pct(TIME_SHARE)} makes a time column). A time is an axis, not a set of levels: it is not encoded, and encode passes it through unchanged so it can order a time-based validation split.`,
    `Range ${min ?? "none"} to ${max ?? "none"} over ${count(t.parsed)} rows; granularity ${granularity}${granularity === "day" ? " (every value is a date or at midnight)" : ""}${unparsed > 0 ? `; ${count(unparsed)} non-missing rows do not read as a time and pass through as written` : ""}.`,
    parts.length > 0 ? `Calendar parts worth deriving for a model: ${parts.join(", ")}.` : "The range is too short for calendar parts.",
    `Use --as-categorical ${name} to profile it as levels instead.`,
  ];
  const column = unmeasuredColumn(name, "time", f.rows, missing, reasons[0]!);
  return {
    ...column,
    recommendation: { encoding: "keep", params: { role: "time" }, reasons },
    time: { min, max, granularity, parsedRows: t.parsed, unparsedRows: unparsed, sampledShare: sampled, calendarParts: parts },
  };
}

/** The profile of a numeric or time column after the pass. */
export function passThroughProfile(name: string, totals: PassTotals, samples: readonly ColumnSample[] | undefined, time: readonly string[] | undefined): ColumnProfile {
  const facts: PassThroughFacts = {
    rows: totals.rows, nonMissing: totals.nonMissing.get(name) ?? 0,
    ...(samples?.find((s) => s.name === name) ? { sample: samples.find((s) => s.name === name)! } : {}),
    ...(totals.distinct?.get(name) ? { exact: totals.distinct.get(name)! } : {}),
    ...(totals.time?.get(name) ? { time: totals.time.get(name)! } : {}),
  };
  return time?.includes(name) ? timeColumnProfile(name, facts) : numericColumnProfile(name, facts);
}
