/**
 * profile/columnFigures: the target-free figures of one column, computed from its count-of-counts
 * and top levels (both bounded), never from the raw rows.
 */
import { coverageLevels } from "../stats/coverageLevels.js";
import { effectiveLevels } from "../stats/effectiveLevels.js";
import { entropyBits } from "../stats/entropyBits.js";
import { goodTuringUnseen } from "../stats/goodTuringUnseen.js";
import { goodTuringUnseenInterval } from "../stats/goodTuringUnseenInterval.js";
import { rareLevels } from "../stats/rareLevels.js";
import { summariseCountOfCounts } from "../stats/summariseCountOfCounts.js";
import type { CountOfCounts } from "../stats/types.js";
import type { ColumnProfile, ColumnRole, LevelFigure } from "./types.js";

export const COVERAGE_SHARES = [0.5, 0.8, 0.9, 0.95, 0.99] as const;
export const RARE_THRESHOLDS = [1, 5, 10, 30, 100] as const;

export interface ColumnCounts {
  name: string;
  rows: number;
  missing: number;
  countOfCounts: CountOfCounts[];
  top: { level: string | null; rows: number }[];
  variants?: { groups: number; levels: number; rows: number; examples: string[][] };
}

/** Figures without a target; the recommendation is filled in by advice/. */
export function columnFigures(c: ColumnCounts): Omit<ColumnProfile, "recommendation"> {
  const summary = summariseCountOfCounts(c.countOfCounts);
  const nonMissing = summary.rows;
  const interval = goodTuringUnseenInterval(c.countOfCounts);
  const topLevels: LevelFigure[] = c.top.map((t) => ({ value: t.level, rows: t.rows, share: c.rows > 0 ? t.rows / c.rows : 0 }));
  const figures: Omit<ColumnProfile, "recommendation"> = {
    name: c.name,
    role: "categorical" as ColumnRole,
    rows: c.rows,
    missing: c.missing,
    distinct: summary.distinct,
    entropyBits: entropyBits(c.countOfCounts),
    effectiveLevels: effectiveLevels(c.countOfCounts),
    singletons: summary.singletons,
    unseenRate: goodTuringUnseen(c.countOfCounts) ?? 0,
    ...(interval ? { unseenInterval: { low: interval.low, high: interval.high } } : {}),
    coverage: nonMissing > 0 ? coverageLevels(c.countOfCounts, COVERAGE_SHARES) : [],
    rare: nonMissing > 0 ? rareLevels(c.countOfCounts, RARE_THRESHOLDS) : [],
    topLevels,
    countOfCounts: c.countOfCounts,
  };
  if (c.variants && c.variants.groups > 0) {
    figures.variants = {
      groups: c.variants.groups,
      levels: c.variants.levels,
      rowShare: c.rows > 0 ? c.variants.rows / c.rows : 0,
      examples: c.variants.examples,
    };
  }
  return figures;
}

/** Identifier-like: distinct ≥ 50 % of non-missing rows, or Good-Turing unseen rate ≥ 0.5. */
export function isIdentifierLike(distinct: number, nonMissing: number, unseenRate: number): boolean {
  return nonMissing > 0 && distinct > 1 && (distinct >= 0.5 * nonMissing || unseenRate >= 0.5);
}

/** A column profile for a column that is not measured (numeric, target or excluded). */
export function unmeasuredColumn(name: string, role: ColumnRole, rows: number, missing: number, reason: string): ColumnProfile {
  return {
    name, role, rows, missing, distinct: 0, entropyBits: 0, effectiveLevels: 0, singletons: 0, unseenRate: 0,
    coverage: [], rare: [], topLevels: [],
    recommendation: { encoding: role === "excluded" ? "drop" : "keep", params: {}, reasons: [reason] },
  };
}
