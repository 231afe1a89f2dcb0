/**
 * render/passThroughFigures: the figures of numeric and time columns and of placeholder levels,
 * as plain text for the decision record and the HTML report (render/figures calls these).
 */
import type { ColumnProfile } from "../profile/types.js";
import { formatCount, formatShare } from "./format.js";

/** A labelled figure, as render/figures' Figure (declared here so the two modules do not import each other). */
interface Figure { label: string; value: string }

/** "5 (exact)" or "≥ 4,213 (first 50,000 rows)". */
export function numericValuesText(column: ColumnProfile): string | null {
  const v = column.numericValues;
  if (!v) return null;
  return v.exact ? `${formatCount(v.distinct)} (exact)` : `≥ ${formatCount(v.distinct)} (first ${formatCount(v.sampledRows ?? 50_000)} rows)`;
}

/** "2024-01-01 – 2025-06-30, day". */
export function timeRangeText(column: ColumnProfile): string | null {
  const t = column.time;
  if (!t) return null;
  return `${t.min ?? "—"} – ${t.max ?? "—"}, ${t.granularity}`;
}

/** "25.0 %" of rows spelled like missing, or "" when there are none. */
export function placeholderShareText(column: ColumnProfile): string {
  return column.placeholders ? formatShare(column.rows > 0 ? column.placeholders.rows / column.rows : 0) : "";
}

export function passThroughFigures(column: ColumnProfile): Figure[] {
  const out: Figure[] = [];
  const values = numericValuesText(column);
  if (values) out.push({ label: column.numericValues?.integer ? "distinct values (integers)" : "distinct values", value: values });
  const t = column.time;
  if (t) {
    out.push({ label: "time range", value: `${t.min ?? "—"} to ${t.max ?? "—"}` }, { label: "granularity", value: t.granularity });
    if (t.unparsedRows > 0) out.push({ label: "values that are not a time", value: formatCount(t.unparsedRows) });
    out.push({ label: "calendar parts to derive", value: t.calendarParts.length > 0 ? t.calendarParts.join(", ") : "none (short range)" });
  }
  return out;
}

/** The placeholder figure shown beside missing, e.g. "29,000 (25.2 %) in 3 levels: 'Unk' 28,750, …". */
export function placeholderFigure(column: ColumnProfile): Figure | null {
  const p = column.placeholders;
  if (!p) return null;
  const share = formatShare(column.rows > 0 ? p.rows / column.rows : 0);
  const examples = p.top.slice(0, 3).map((l) => `'${l.value}' ${formatCount(l.rows)}`).join(", ");
  return { label: "spelled like missing (placeholders)", value: `${formatCount(p.rows)} (${share}) in ${formatCount(p.levels)} level${p.levels === 1 ? "" : "s"}: ${examples}${p.levels > 3 ? ", …" : ""} — --missing-like treats them as missing` };
}

/** Plain-words notes on the roles of this issue that appear in the profile (decision record and report). */
export function roleNotes(profile: { columns: readonly ColumnProfile[] }): string[] {
  const notes: string[] = [];
  const has = (pred: (c: ColumnProfile) => boolean) => profile.columns.some(pred);
  if (has((c) => c.role === "time")) {
    notes.push("Role time: the column holds dates or timestamps (at least 95 % of the sampled values). It is a time axis, not a category, so its levels are not counted or encoded; encode passes it through unchanged, and the record gives its range, its granularity and the calendar parts (hour, day of week, month, year) worth deriving from it.");
  }
  if (has((c) => c.role === "identifier" && c.numericValues !== undefined)) {
    notes.push("Numeric identifier: a column of integers with a different value on (nearly) every row (at least 99 %, counted exactly) is a row key, not a measurement; it is dropped (encode --keep passes it through).");
  }
  if (has((c) => c.role === "numeric")) {
    notes.push("Role numeric: every sampled value is a plain number; it is passed through as a number however few values it has (a count of 0–5 stays a count), and the record says how many distinct values it has. --as-categorical profiles it as levels instead.");
  }
  if (has((c) => c.placeholders !== undefined)) {
    notes.push("Placeholders: some levels are spelled like a missing value (unknown, N/A, [no …] and similar). They are still counted as levels; scan --missing-like VALUE,… reads them as missing in every command.");
  }
  return notes;
}
