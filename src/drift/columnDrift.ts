/**
 * drift/columnDrift: one plan column's comparison with the new extract, from bounded summaries
 * (its totals on both sides and the plan's top levels): unseen share against the forecast, PSI,
 * distinct-level growth, the top levels' target shift, and the status with its reasons.
 * Distinct growth is reported but sets no status: distinct counts grow with sample size, so
 * extracts of different sizes are not comparable on it.
 */
import type { ColumnProfile, TargetKind } from "../profile/types.js";
import type { NewStats, SideStats, TopLevelRow } from "./compareSql.js";
import { psiCheck } from "./psiRule.js";
import { rateShift } from "./rateShift.js";
import { columnStatus } from "./status.js";
import { levelShiftVerdict } from "./targetRule.js";
import type { ColumnDrift, ColumnTargetShift, DriftThresholds, LevelShift, Verdict } from "./types.js";
import { unseenCheck } from "./unseenRule.js";

export interface TargetContext { column: string; kind: TargetKind; planSd: number | null }

/** A plan column the new extract lacks: act ("column missing"), capped at watch when the plan drops it. */
export function missingColumnDrift(c: ColumnProfile): ColumnDrift {
  const { status, reasons } = columnStatus([{ status: "act", reason: `Column missing: the new extract has no column '${c.name}'.` }], c.recommendation.encoding);
  return {
    name: c.name, role: c.role, encoding: c.recommendation.encoding, present: false,
    rows: 0, missing: 0, distinct: 0, newLevels: 0, unseenRows: 0, unseenShare: null, unseenInterval: null,
    unseenForecast: c.rows - c.missing > 0 ? c.unseenRate : null, unseenForecastInterval: c.unseenInterval ?? null,
    psi: null, psiBins: 0, distinctGrowth: null, status, reasons,
  };
}

/**
 * The top levels' target shift. Intervals are simultaneous over the k levels with a target on
 * both sides: each at confidence 1 − 0.05/k (Bonferroni; Dunn 1961). With about 20 levels in
 * each of a dozen columns, plain 95 % intervals would separate by chance about once per run.
 */
function targetShift(top: readonly TopLevelRow[], target: TargetContext): ColumnTargetShift {
  const k = Math.max(1, top.filter((r) => r.plan_n_y > 0 && r.new_n_y > 0).length);
  const confidence = 1 - 0.05 / k;
  const levels: LevelShift[] = top.map((r) => {
    const s = rateShift(target.kind, { n: r.plan_n_y, sum: r.plan_sum_y, sum2: r.plan_sum_y2 },
      { n: r.new_n_y, sum: r.new_sum_y, sum2: r.new_sum_y2 }, target.planSd, confidence);
    const excludesPlanRate = s.interval !== null && s.planRate !== null && (s.planRate < s.interval.low || s.planRate > s.interval.high);
    return { value: r.level, ...s, excludesPlanRate };
  });
  return {
    confidence,
    tested: levels.filter((l) => l.planRate !== null && l.rate !== null).length,
    flagged: levels.filter((l) => l.excludesPlanRate).length,
    separated: levels.filter((l) => l.separated).length,
    levels,
  };
}

/** A plan column present in the new extract. `target` is set when both sides have the target. */
export function presentColumnDrift(
  c: ColumnProfile, plan: SideStats, now: NewStats, top: readonly TopLevelRow[],
  target: TargetContext | null, t: DriftThresholds,
): ColumnDrift {
  const planNonMissing = plan.rows - plan.missing;
  const unseen = unseenCheck(now.unseen_rows, now.rows - now.missing, planNonMissing > 0 ? c.unseenRate : null, c.unseenInterval ?? null, t, c.role === "identifier");
  const topRows = (xs: number[]) => xs.reduce((s, x) => s + x, 0);
  const planTop = top.map((r) => r.plan_rows);
  const newTop = top.map((r) => r.new_rows);
  const psi = psiCheck({
    planTop, newTop,
    planRest: planNonMissing - topRows(planTop), newRest: now.rows - now.missing - topRows(newTop),
    planMissing: plan.missing, newMissing: now.missing,
  }, t);
  const verdicts: Verdict[] = [psi.verdict, unseen.verdict];
  const shift = target ? targetShift(top, target) : undefined;
  if (shift && target) verdicts.push(levelShiftVerdict(shift, target.column, target.kind, t));
  const { status, reasons } = columnStatus(verdicts, c.recommendation.encoding);
  return {
    name: c.name, role: c.role, encoding: c.recommendation.encoding, present: true,
    rows: now.rows, missing: now.missing, distinct: now.levels, newLevels: now.new_levels, unseenRows: now.unseen_rows,
    unseenShare: unseen.share, unseenInterval: unseen.interval,
    unseenForecast: planNonMissing > 0 ? c.unseenRate : null, unseenForecastInterval: c.unseenInterval ?? null,
    psi: psi.psi, psiBins: psi.bins, distinctGrowth: plan.levels > 0 ? now.levels / plan.levels : null,
    ...(shift ? { targetShift: shift } : {}),
    status, reasons,
  };
}
