import { coverageLevels } from "../../stats/coverageLevels.js";
import type { ColumnProfile, Recommendation } from "../../profile/types.js";
import type { AdvicePolicy } from "../policy.js";
import { count, pct } from "../words.js";

const levelValues = (column: ColumnProfile, k: number) =>
  column.topLevels.slice(0, k).map((l) => l.value).filter((v): v is string => v !== null);

/** Rule 2: two levels: one 0/1 indicator (1 = the less frequent level). */
export function indicatorRule(column: ColumnProfile): Recommendation | null {
  if (column.distinct !== 2) return null;
  const [common, rare] = column.topLevels;
  if (!common || !rare) return null;
  return {
    encoding: "indicator",
    params: { one: rare.value, zero: common.value },
    reasons: [`Indicator: exactly 2 levels; 1 marks '${rare.value}' (${pct(rare.share)} of rows), 0 marks '${common.value}' (${pct(common.share)}); missing rows (${count(column.missing)}) get 0.`],
  };
}

/** Rule 3: few levels, each with enough rows: plain one-hot. */
export function oneHotRule(column: ColumnProfile, policy: AdvicePolicy): Recommendation | null {
  if (column.distinct > policy.maxOneHot) return null;
  const smallest = column.topLevels[column.distinct - 1];
  if (column.topLevels.length < column.distinct || !smallest || smallest.rows < policy.minLevelRows) return null;
  return {
    encoding: "one-hot",
    params: { levels: levelValues(column, column.distinct) },
    reasons: [`One-hot: ${column.distinct} levels fit the one-hot width of ${policy.maxOneHot}, and the smallest ('${smallest.value}') has ${count(smallest.rows)} rows, at least the ${policy.minLevelRows} a level needs.`],
  };
}

/** Rule 4: the levels covering the coverage target fit in the width: pool the rest into "other". */
export function pooledOneHotRule(column: ColumnProfile, policy: AdvicePolicy): Recommendation | null {
  const counts = column.countOfCounts;
  if (!counts || counts.length === 0) return null;
  const needed = coverageLevels(counts, [policy.coverage])[0]?.levels ?? Infinity;
  const width = policy.maxOneHot - 1;
  if (needed > width) return null;
  const kept = column.topLevels.slice(0, needed).filter((l) => l.value !== null && l.rows >= policy.minLevelRows);
  if (kept.length === 0 || kept.length < needed) return null;
  const nonMissing = column.rows - column.missing;
  const keptRows = kept.reduce((s, l) => s + l.rows, 0);
  const pooledRowShare = nonMissing > 0 ? 1 - keptRows / nonMissing : 0;
  return {
    encoding: "pooled-one-hot",
    params: { keep: kept.flatMap((l) => (l.value === null ? [] : [l.value])), other: "other", pooledRowShare, minRows: policy.minLevelRows },
    reasons: [
      `Pooled one-hot: ${count(column.distinct)} levels are more than the one-hot width of ${policy.maxOneHot} allows, but the top ${kept.length} cover ${pct(1 - pooledRowShare)} of non-missing rows (target ${pct(policy.coverage, 0)}).`,
      `The other ${count(column.distinct - kept.length)} levels (${pct(pooledRowShare)} of rows) are pooled into one "other" column.`,
    ],
  };
}
