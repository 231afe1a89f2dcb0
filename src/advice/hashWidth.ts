/**
 * advice/hashWidth: the hashing rule's measurement — for every categorical column wider than the
 * one-hot limit, the exact colliding row share at each candidate width (engine/hashing, over the
 * level table), and the width chosen: the smallest power of two whose colliding row share is
 * within the collision budget, else the widest. hashingRule turns `column.hashing` into advice.
 */
import type { Engine } from "../engine/db.js";
import { collisionTable, HASH_NAME } from "../engine/hashing.js";
import type { ColumnProfile } from "../profile/types.js";
import { hashWidths, type AdvicePolicy } from "./policy.js";

export async function addHashing(engine: Engine, columns: ColumnProfile[], policy: AdvicePolicy): Promise<void> {
  const cols = columns.map((c, i) => ({ c, i })).filter(({ c }) => c.role === "categorical" && c.distinct > policy.maxOneHot).map(({ i }) => i);
  const table = await collisionTable(engine, cols, hashWidths(policy));
  for (const col of cols) {
    const rows = table.filter((r) => r.col === col);
    if (rows.length === 0) continue;
    const candidates = rows.map((r) => ({ width: r.width, collisionRowShare: r.rows > 0 ? r.collisionRows / r.rows : 0, collidingLevels: r.collidingLevels ?? 0 }));
    const chosen = candidates.find((c) => c.collisionRowShare <= policy.collisionBudget) ?? candidates[candidates.length - 1]!;
    const column = columns[col]!;
    column.hashing = { width: chosen.width, collisionRowShare: chosen.collisionRowShare, hash: HASH_NAME, candidates };
  }
}
