/**
 * Plain TypeScript reference computations for the hierarchy tests (loops over levels, no SQL).
 */
import { parentOf } from "../../src/hierarchy/parent.js";
import type { ParentSpec } from "../../src/hierarchy/types.js";

/** Rows per value. */
export function counts(values: readonly string[]): Map<string, number> {
  const out = new Map<string, number>();
  for (const v of values) out.set(v, (out.get(v) ?? 0) + 1);
  return out;
}

/** Median (mean of the two middle values for an even count). */
export function median(values: readonly number[]): number {
  const s = [...values].sort((a, b) => a - b);
  const mid = Math.floor(s.length / 2);
  return s.length % 2 === 1 ? s[mid]! : (s[mid - 1]! + s[mid]!) / 2;
}

/**
 * The backoff cascade: a level with ≥ minRows rows is its own group; then, deepest parent first,
 * still-unmapped levels sharing a parent form a group when they have ≥ minRows rows together;
 * the rest are "other". Group keys are "depth\0text"; `of` maps each level to its key (null = other).
 */
export function backoffGroups(levels: ReadonlyMap<string, number>, parents: readonly ParentSpec[], minRows: number) {
  const of = new Map<string, string | null>();
  for (const [level, n] of levels) of.set(level, n >= minRows ? `0\u0000${level}` : null);
  for (let d = parents.length; d >= 1; d--) {
    const pool = new Map<string, number>();
    for (const [level, n] of levels) {
      if (of.get(level) !== null) continue;
      const p = parentOf(parents[d - 1]!, level);
      pool.set(p, (pool.get(p) ?? 0) + n);
    }
    for (const [level] of levels) {
      if (of.get(level) !== null) continue;
      const p = parentOf(parents[d - 1]!, level);
      if ((pool.get(p) ?? 0) >= minRows) of.set(level, `${d}\u0000${p}`);
    }
  }
  const groups = new Map<string, number>();
  let total = 0;
  let parentRows = 0;
  for (const [level, n] of levels) {
    total += n;
    const key = of.get(level) ?? null;
    if (key === null) continue;
    groups.set(key, (groups.get(key) ?? 0) + n);
    if (!key.startsWith("0\u0000")) parentRows += n;
  }
  const grouped = [...groups.values()].reduce((a, b) => a + b, 0);
  return { of, groups, coverage: grouped / total, parentShare: parentRows / total };
}
