/**
 * render/passThroughFigures: the figures of numeric and time columns and of placeholder levels,
 * as plain text for the decision record and the HTML report (render/figures calls these).
 */
import type { ColumnProfile } from "../profile/types.js";
import { formatCount, formatShare } from "./format.js";
import type { Figure } from "./figures.js";

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
