/**
 * Brute-force references for the hashing of backoff groups, in plain TypeScript over parsed
 * rows: loops only, no SQL and no code shared with src/. Groups come from
 * hierarchyBruteForce.backoffGroupOf (the backoff cascade re-done by hand from the training
 * counts, as "depth|key"); buckets from node:crypto. The hashing trick (Weinberger et al. 2009)
 * with MD5 as the hash: bucket = little-endian uint64 of MD5's first 8 bytes mod width (the
 * definition engine/hashing documents; md5_number_upper in DuckDB).
 */
import { createHash } from "node:crypto";
import type { GroupOf } from "./hierarchyBruteForce.js";
import type { Cell } from "./helpers.js";

/** A group key's bucket, computed in Node: MD5(salt ‖ key) first 8 bytes little-endian, mod width. */
export function keyBucket(key: string, width: number, salt = ""): number {
  return Number(createHash("md5").update(salt + key, "utf8").digest().readBigUInt64LE(0) % BigInt(width));
}

/** Splits a GroupOf result "depth|key" into its parts. */
export function splitGroup(group: string): { depth: number; key: string } {
  const bar = group.indexOf("|");
  return { depth: Number(group.slice(0, bar)), key: group.slice(bar + 1) };
}

/** Row by row: missing → null; the "other" group → width (not hashed); else the bucket of the group's key. */
export function hashedGroups(levels: readonly Cell[], groupOf: GroupOf, width: number, salt = ""): (number | null)[] {
  return levels.map((level) => {
    if (level === null) return null;
    const g = splitGroup(groupOf(level));
    return g.depth < 0 ? width : keyBucket(g.key, width, salt);
  });
}

/**
 * The share of rows in groups (missing rows and rows at index `width`, "other", left out) whose
 * bucket also holds another group: `groups` per row from the reference, `buckets` per row from
 * encode's output. No such rows → null.
 */
export function collisionRowShare(groups: readonly (string | null)[], buckets: readonly unknown[], width: number): number | null {
  const groupsIn = new Map<number, Set<string>>();
  const rows: { bucket: number; group: string }[] = [];
  groups.forEach((group, k) => {
    const b = buckets[k];
    if (group === null || b === null || b === undefined || Number(b) === width) return;
    rows.push({ bucket: Number(b), group });
    const set = groupsIn.get(Number(b)) ?? new Set<string>();
    set.add(group);
    groupsIn.set(Number(b), set);
  });
  if (rows.length === 0) return null;
  let colliding = 0;
  for (const r of rows) if ((groupsIn.get(r.bucket)?.size ?? 0) > 1) colliding++;
  return colliding / rows.length;
}
