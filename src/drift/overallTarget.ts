/**
 * drift/overallTarget: the whole extract's target rate (binary) or mean (continuous) against the
 * plan's, with 95 % intervals (Wilson, or mean ± t), its effect size, and a status of at most
 * watch. The plan's sums come from its level table (exact Σy and Σy² over every row with a
 * target); the profile's rounded mean and sd stand in only when the table has no column.
 */
import type { ProfileTarget } from "../profile/types.js";
import { formatCount } from "../render/format.js";
import { rateShift, type TargetSums } from "./rateShift.js";
import { overallTargetVerdict } from "./targetRule.js";
import type { DriftTarget } from "./types.js";

/**
 * @param planSums Σ over any one column of the plan's level table, or undefined
 * @param current the new extract's target rows and sums, and the count of values that fit
 *   neither target class (left out, and said so in the reasons)
 */
export function overallTarget(
  planTarget: ProfileTarget, planSums: TargetSums | undefined, current: TargetSums & { bad: number },
): DriftTarget {
  const plan = planSums ?? {
    n: planTarget.rows, sum: planTarget.mean * planTarget.rows,
    sum2: planTarget.rows * ((planTarget.sd ?? 0) ** 2 + planTarget.mean ** 2),
  };
  const shift = rateShift(planTarget.kind, plan, current, planTarget.sd ?? null);
  const verdict = overallTargetVerdict(shift, planTarget.column, planTarget.kind);
  const reasons = [verdict.reason];
  if (current.bad > 0) {
    reasons.push(`${formatCount(current.bad)} target values fit the plan's target kind neither way and were left out.`);
  }
  return { column: planTarget.column, kind: planTarget.kind, ...shift, bad: current.bad, status: verdict.status, reasons };
}
