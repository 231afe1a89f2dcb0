import type { ColumnProfile, Recommendation } from "../../profile/types.js";
import { expectedCollidingLevels } from "../../stats/expectedCollidingLevels.js";
import type { AdvicePolicy } from "../policy.js";
import { count, pct } from "../words.js";

/**
 * Rule 6 (no target, or the last resort): codes when the levels that matter fit within the
 * width cap (advice/hashWidth: a closed vocabulary is indexed, not hashed); else the hashing
 * trick, width = the smallest power of two up to the cap whose exact colliding row share over
 * those levels' rows (computed over the level table) stays within the budget.
 */
export function hashingRule(column: ColumnProfile, policy: AdvicePolicy): Recommendation {
  const hashing = column.hashing;
  if (!hashing) {
    // not measured (e.g. a user override on a column the hashing step skipped): the expected
    // colliding share of uniformly hashed levels, n − w(1 − (1 − 1/w)ⁿ) over n, stands in
    let width = 2 ** policy.hashMaxBits;
    for (let b = policy.hashMinBits; b <= policy.hashMaxBits; b++) {
      if (column.distinct === 0 || expectedCollidingLevels(column.distinct, 2 ** b) / column.distinct <= policy.collisionBudget) { width = 2 ** b; break; }
    }
    return {
      encoding: "hashing",
      params: { width, collisionRowShare: null, hash: "md5-first8-le", salt: "" },
      reasons: [`Hashing into ${count(width)} buckets: collisions were not counted for this column, so the width is the smallest power of two whose expected share of colliding levels (uniform hashing of ${count(column.distinct)} levels) is within ${pct(policy.collisionBudget, 1)}.`],
    };
  }
  const f = hashing.frequent;
  if (hashing.index && f) {
    // advice/hashWidth: a closed vocabulary that fits the cap is indexed, not hashed
    return {
      encoding: "codes",
      params: { tableSize: f.levels, order: "descending training frequency", unseen: 0 },
      reasons: [
        `${f.minRows === policy.minLevelRows ? `Codes for the ${count(f.levels)} levels with at least ${count(f.minRows)} rows (${pct(f.rowShare)} of non-missing rows)` : `Codes for the ${count(f.levels)} levels seen at least ${count(f.minRows)} time${f.minRows === 1 ? "" : "s"} (${pct(f.rowShare)} of non-missing rows; levels with ${count(policy.minLevelRows)} rows hold under half of them)`}, numbered by training rows; rarer, unseen and missing levels share code 0: ${count(column.distinct)} levels are too many for one-hot and there is no target to encode against.`,
        `Indexed rather than hashed: the frequent levels form a closed vocabulary that fits within ${count(2 ** policy.hashMaxBits)} (the --max-hash-bits cap), so every one keeps its own code and none collide; hashing would have needed ${count(hashing.width)} buckets for ${pct(hashing.collisionRowShare, 2)} of their rows to collide.`,
      ],
    };
  }
  const within = hashing.collisionRowShare <= policy.collisionBudget;
  const judged = f && f.minRows > 1 ? ` (counted exactly over the rows of the ${count(f.levels)} levels with at least ${count(f.minRows)} rows; rarer levels carry too few rows to matter)` : " (counted exactly over every level)";
  return {
    encoding: "hashing",
    params: { width: hashing.width, collisionRowShare: hashing.collisionRowShare, hash: hashing.hash ?? "md5-first8-le", salt: "" },
    reasons: [
      `Hashing into ${count(hashing.width)} buckets: ${count(column.distinct)} levels need ${count(column.coverage.find((c) => c.share === 0.95)?.levels ?? column.distinct)} levels for 95 % of rows, too many for one-hot, and there is no target to encode against.`,
      within
        ? `${count(hashing.width)} is the smallest power of two whose colliding row share (${pct(hashing.collisionRowShare, 2)}${judged}) is within the budget of ${pct(policy.collisionBudget, 1)}.`
        : `No width up to the cap of ${count(2 ** policy.hashMaxBits)} (--max-hash-bits ${policy.hashMaxBits}) keeps colliding rows within ${pct(policy.collisionBudget, 1)}; at the cap, ${pct(hashing.collisionRowShare, 2)} of rows collide${judged}.`,
    ],
  };
}
