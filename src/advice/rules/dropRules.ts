import type { ColumnProfile, Recommendation } from "../../profile/types.js";
import { pct, count } from "../words.js";

/** Rule 1a: one non-missing level (or none) carries no information: drop. */
export function constantRule(column: ColumnProfile): Recommendation | null {
  if (column.distinct > 1) return null;
  const what = column.distinct === 0
    ? `every one of its ${count(column.rows)} rows is missing`
    : `it has a single level ('${column.topLevels[0]?.value ?? ""}') across ${count(column.rows - column.missing)} non-missing rows`;
  return { encoding: "drop", params: { role: "constant" }, reasons: [`Drop: ${what}, so it cannot separate rows.`] };
}

/** Rule 1b: distinct ≥ 50 % of non-missing rows or unseen rate ≥ 0.5: an identifier; drop. */
export function identifierRule(column: ColumnProfile): Recommendation | null {
  if (column.role !== "identifier") return null;
  const nonMissing = column.rows - column.missing;
  const reasons = [
    `Drop: ${count(column.distinct)} distinct levels in ${count(nonMissing)} non-missing rows (${pct(column.distinct / Math.max(1, nonMissing))}) and a Good-Turing unseen-level rate of ${pct(column.unseenRate)} mean most levels are seen once; an encoding of it cannot generalise and an in-sample mean of it leaks the target.`,
  ];
  const leak = column.target?.leakage;
  // at m = ∞ (no detectable spread, weightUsed null) the scored encoding is the prior itself: no gap to show
  if (leak && leak.inSample !== null && leak.outOfFold !== null && leak.weightUsed !== null) {
    reasons.push(`In-sample ${leak.metric.toUpperCase()} ${leak.inSample.toFixed(3)} against out-of-fold ${leak.outOfFold.toFixed(3)}: the gap is what a naive mean encoding would leak.`);
  }
  return { encoding: "drop", params: { role: "identifier" }, reasons };
}
