/**
 * pipeline/columnKinds: the one place that splits the measured columns by kind from the sample,
 * before the pass (the pass plan depends on it): time columns first (a date is not a number),
 * then numeric columns (every sampled value a plain number, however few values), the rest are
 * counted as levels. `--as-categorical` (`forced`) wins over both. Of the numeric columns, those
 * with few sampled values or that screen as a row key get an exact distinct count in the pass
 * (engine/inspect needsExactDistinct); advice/passThroughColumns decides on them after the pass.
 */
import { looksNumeric, looksTime, needsExactDistinct, type ColumnSample } from "../engine/inspect.js";

export interface ColumnKinds {
  levelColumns: string[];
  numeric: string[];
  time: string[];
  /** Of `numeric`: the columns whose distinct values the pass counts exactly. */
  distinct: string[];
}

export function planColumnKinds(candidates: readonly string[], samples: readonly ColumnSample[], forced: ReadonlySet<string>): ColumnKinds {
  const free = samples.filter((s) => !forced.has(s.name));
  const time = free.filter(looksTime).map((s) => s.name);
  const numericSamples = free.filter((s) => !time.includes(s.name) && looksNumeric(s));
  const numeric = numericSamples.map((s) => s.name);
  return {
    levelColumns: candidates.filter((c) => !numeric.includes(c) && !time.includes(c)),
    numeric, time, distinct: numericSamples.filter(needsExactDistinct).map((s) => s.name),
  };
}
