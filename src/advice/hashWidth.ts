/**
 * advice/hashWidth: the hashing rule's measurement, for every categorical column wider than the
 * one-hot limit (addHashing): the exact colliding row share at each candidate width
 * (engine/hashing, over the level table), the width chosen, and whether to hash at all.
 * hashingRule turns `column.hashing` into advice.
 *  - The collision budget is judged on the rows of the levels frequent enough to matter:
 *    levels with at least minLevelRows rows (the same bar a level needs for its own one-hot
 *    column), or, when those hold under half the rows, levels seen more than once
 *    (levelsThatMatter). A level seen once carries no weight a model can learn, so two such
 *    levels sharing a bucket lose nothing; counting them would let a long uniform tail of
 *    singletons force widths of millions (common practice: judge collisions where the mass is).
 *  - A closed vocabulary that fits is indexed, not hashed: when the frequent levels number at
 *    least 1 and at most the cap 2^maxHashBits, the column gets "codes" over them (rank by
 *    training rows; rarer and unseen levels share code 0). Hashing remains for vocabularies
 *    wider than the cap.
 *  - Widths are capped at 2^maxHashBits (default 2^20, about a million columns, past which a
 *    hashed input is not a practical model input — common practice); at the cap the colliding
 *    share is stated as it is, within the budget or not.
 */
import type { Engine } from "../engine/db.js";
import { collisionTable, HASH_NAME } from "../engine/hashing.js";
import type { ColumnProfile } from "../profile/types.js";
import { hashWidths, type AdvicePolicy } from "./policy.js";

export interface WidthCandidate { width: number; collisionRowShare: number; collidingLevels?: number }

export interface HashWidthChoice {
  /** "codes": index the frequent levels; "hashing": hash at `width`. */
  kind: "codes" | "hashing";
  /** Levels with at least minLevelRows rows, and their share of non-missing rows. */
  frequentLevels: number;
  frequentRowShare: number;
  width: number;
  /** Share of the frequent levels' rows that share a bucket with another frequent level. */
  collisionRowShare: number;
  /** No candidate width up to the cap is within the budget: the widest is taken. */
  atCap: boolean;
}

/**
 * Candidates are the measured widths smallest first (collisions over the frequent levels'
 * rows); widths past the cap are ignored. Edge cases: no frequent level → nothing can collide
 * that matters: the smallest width 2^minBits, share 0; frequent levels but no candidate within
 * the cap → the cap with share 1 (unmeasured, stated as all rows).
 */
export function chooseHashWidth(candidates: readonly WidthCandidate[], frequentLevels: number, frequentRowShare: number, policy: AdvicePolicy): HashWidthChoice {
  const cap = 2 ** policy.hashMaxBits;
  if (frequentLevels === 0) return { kind: "hashing", frequentLevels, frequentRowShare, width: 2 ** policy.hashMinBits, collisionRowShare: 0, atCap: false };
  const within = candidates.filter((c) => c.width <= cap);
  const fits = within.find((c) => c.collisionRowShare <= policy.collisionBudget);
  const chosen = fits ?? within[within.length - 1] ?? { width: cap, collisionRowShare: 1 };
  const kind = frequentLevels >= 1 && frequentLevels <= cap ? "codes" : "hashing";
  return { kind, frequentLevels, frequentRowShare, width: chosen.width, collisionRowShare: chosen.collisionRowShare, atCap: !fits };
}

/** The frequent levels must hold at least this share of rows, else the bar drops to 2 rows (see levelsThatMatter). */
export const FREQUENT_MIN_SHARE = 0.5;

/**
 * The levels that matter, from the count-of-counts: those with at least minLevelRows rows when
 * they hold at least FREQUENT_MIN_SHARE of the non-missing rows; else (the mass lies below the
 * bar, so nothing stands out) those seen more than once — a level seen once has nothing to learn
 * from — and when every level is a singleton, all of them. Returns the bar used, the levels and
 * their share of non-missing rows (engine/hashing's collisionTable counts the same levels).
 */
export function levelsThatMatter(countOfCounts: readonly { count: number; levels: number }[], minLevelRows: number): { minRows: number; levels: number; rowShare: number } {
  const over = (bar: number) => {
    let levels = 0, rows = 0, total = 0;
    for (const c of countOfCounts) {
      total += c.count * c.levels;
      if (c.count >= bar) { levels += c.levels; rows += c.count * c.levels; }
    }
    return { minRows: bar, levels, rowShare: total > 0 ? rows / total : 0 };
  };
  const frequent = over(minLevelRows);
  if (frequent.levels > 0 && frequent.rowShare >= FREQUENT_MIN_SHARE) return frequent;
  const repeated = over(Math.min(2, minLevelRows));
  return repeated.levels > 0 ? repeated : over(1);
}

/** The `hashing` figures a column without a target carries (addHashing). */
export function hashingFigures(column: ColumnProfile, candidates: WidthCandidate[], policy: AdvicePolicy): NonNullable<ColumnProfile["hashing"]> {
  const f = levelsThatMatter(column.countOfCounts ?? [], policy.minLevelRows);
  const c = chooseHashWidth(candidates, f.levels, f.rowShare, policy);
  return {
    width: c.width, collisionRowShare: c.collisionRowShare, hash: HASH_NAME, candidates,
    frequent: { minRows: f.minRows, levels: c.frequentLevels, rowShare: c.frequentRowShare }, atCap: c.atCap, index: c.kind === "codes",
  };
}

/** Measures `column.hashing` for every categorical column past the one-hot limit (pipeline/advise, no target). */
export async function addHashing(engine: Engine, columns: ColumnProfile[], policy: AdvicePolicy): Promise<void> {
  const cols = columns.map((c, i) => ({ c, i })).filter(({ c }) => c.role === "categorical" && c.distinct > policy.maxOneHot).map(({ i }) => i);
  const bars = new Map(cols.map((c) => [c, levelsThatMatter(columns[c]!.countOfCounts ?? [], policy.minLevelRows).minRows]));
  const table = await collisionTable(engine, cols, hashWidths(policy), "", bars);
  for (const col of cols) {
    const rows = table.filter((r) => r.col === col);
    const candidates = rows.map((r) => ({ width: r.width, collisionRowShare: r.rows > 0 ? r.collisionRows / r.rows : 0, collidingLevels: r.collidingLevels ?? 0 }));
    columns[col]!.hashing = hashingFigures(columns[col]!, candidates, policy);
  }
}
