import type { ColumnProfile, Recommendation } from "../../profile/types.js";
import { expectedCollidingLevels } from "../../stats/expectedCollidingLevels.js";
import type { AdvicePolicy } from "../policy.js";
import { count, pct } from "../words.js";

/**
 * Rule 6 (no target, or the last resort): the hashing trick, width = the smallest power of two
 * whose exact colliding row share (computed over the level table) stays within the budget.
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
  const within = hashing.collisionRowShare <= policy.collisionBudget;
  return {
    encoding: "hashing",
    params: { width: hashing.width, collisionRowShare: hashing.collisionRowShare, hash: hashing.hash ?? "md5-first8-le", salt: "" },
    reasons: [
      `Hashing into ${count(hashing.width)} buckets: ${count(column.distinct)} levels need ${count(column.coverage.find((c) => c.share === 0.95)?.levels ?? column.distinct)} levels for 95 % of rows, too many for one-hot, and there is no target to encode against.`,
      within
        ? `${count(hashing.width)} is the smallest power of two whose colliding row share (${pct(hashing.collisionRowShare, 2)}, counted exactly over every level) is within the budget of ${pct(policy.collisionBudget, 1)}.`
        : `No width up to ${count(2 ** policy.hashMaxBits)} keeps colliding rows within ${pct(policy.collisionBudget, 1)}; at the widest, ${pct(hashing.collisionRowShare, 2)} of rows collide.`,
    ],
  };
}
