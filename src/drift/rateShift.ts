/**
 * drift/rateShift: the plan's and the new extract's target rate for one group of rows (the whole
 * extract or one level), each with a confidence interval (95 % by default) — Wilson (Wilson 1927)
 * for a binary target, mean ± t·s/√n (meanInterval) for a continuous one — and the effect size
 * of the change. "Separated" means the two intervals do not overlap: at 95 % and equal widths
 * that is a difference of about 2.77 standard errors (two-sided p ≈ 0.006), a deliberately
 * strict call.
 */
import { meanInterval } from "../stats/meanInterval.js";
import { normalQuantile } from "../stats/normalQuantile.js";
import { wilsonInterval } from "../stats/wilsonInterval.js";
import type { TargetKind } from "../profile/types.js";
import { cohensD, cohensH } from "../stats/effectSize.js";
import type { Interval, RateShift } from "./types.js";

/** Target sums of a group: rows with a target, Σy and Σy². */
export interface TargetSums { n: number; sum: number; sum2: number }

function rateOf(kind: TargetKind, s: TargetSums, confidence: number): { rate: number | null; interval: Interval | null } {
  if (s.n === 0) return { rate: null, interval: null };
  const rate = s.sum / s.n;
  if (kind === "binary") {
    const w = wilsonInterval(Math.min(s.sum, s.n), s.n, normalQuantile(1 - (1 - confidence) / 2));
    return { rate, interval: w ? { low: w.low, high: w.high } : null };
  }
  const m = meanInterval(s.n, s.sum, Math.max(0, s.sum2), confidence);
  return { rate, interval: m ? { low: m.low, high: m.high } : null };
}

/**
 * @param planSd the plan's overall target standard deviation (continuous targets: the scale of
 *   Cohen's d); unused for binary targets.
 * @param confidence two-sided level of each interval, in (0, 1); 0.95 by default. Drift lowers
 *   the error rate to 0.05/k for k levels compared at once (Bonferroni; Dunn 1961, JASA 56:52–64).
 * Edge cases: a side with no target rows has rate and interval null; a side with one row
 * (continuous) has a rate but no interval; then `separated` is false and `effect` may be null.
 */
export function rateShift(
  kind: TargetKind, plan: TargetSums, current: TargetSums, planSd: number | null, confidence = 0.95,
): RateShift {
  const p = rateOf(kind, plan, confidence);
  const c = rateOf(kind, current, confidence);
  let effect: number | null = null;
  if (p.rate !== null && c.rate !== null) {
    effect = kind === "binary"
      ? cohensH(Math.min(1, Math.max(0, c.rate)), Math.min(1, Math.max(0, p.rate)))
      : cohensD(c.rate, p.rate, planSd ?? 0);
  }
  const separated = p.interval !== null && c.interval !== null
    && (c.interval.low > p.interval.high || c.interval.high < p.interval.low);
  return {
    planRows: plan.n, planRate: p.rate, planInterval: p.interval,
    rows: current.n, rate: c.rate, interval: c.interval, effect, separated,
  };
}
