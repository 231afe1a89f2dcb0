/**
 * Brute-force references for target encoding over a code hierarchy, in plain TypeScript over
 * parsed rows: loops only, no SQL and no code shared with src/. Parents are prefixes
 * (`level.slice(0, length)`). Each value is recomputed row by row from the definitions:
 * m-estimate (Cestnik 1990): (sum + m·prior)/(n + m), where a group without rows or a null
 * (infinite) weight gives the prior itself.
 */
import type { Cell } from "./helpers.js";

export interface Row { level: Cell; y: number | null; fold: number }

/** m-estimate; n = 0 or m = null → the prior. */
export const estimate = (s: number, n: number, m: number | null, prior: number): number => (m === null || n === 0 ? prior : (s + m * prior) / (n + m));

/** Group of a level: "depth|key" (depth 0 = the level, d ≥ 1 = prefix of lengths[d − 1], −1 = other). */
export type GroupOf = (level: string) => string;

/**
 * The backoff cascade over training rows per level (`rows`, all rows, target or not), prefix
 * `lengths` shallowest first: a level with ≥ minRows rows keeps its own group; then for depth
 * D..1, the still-unmapped levels sharing a prefix form a group when they pool ≥ minRows rows;
 * the rest are "other". A level without training rows takes the deepest depth whose prefix
 * group exists, else "other".
 */
export function backoffGroupOf(rows: ReadonlyMap<string, number>, lengths: readonly number[], minRows: number): GroupOf {
  const of = new Map<string, string>();
  for (const [level, n] of rows) if (n >= minRows) of.set(level, `0|${level}`);
  for (let d = lengths.length; d >= 1; d--) {
    const pool = new Map<string, number>();
    for (const [level, n] of rows) {
      if (of.has(level)) continue;
      const p = level.slice(0, lengths[d - 1]);
      pool.set(p, (pool.get(p) ?? 0) + n);
    }
    for (const [level] of rows) {
      const p = level.slice(0, lengths[d - 1]);
      if (!of.has(level) && (pool.get(p) ?? 0) >= minRows) of.set(level, `${d}|${p}`);
    }
  }
  for (const [level] of rows) if (!of.has(level)) of.set(level, "-1|");
  const groups = new Set(of.values());
  return (level) => {
    const known = of.get(level);
    if (known !== undefined) return known;
    for (let d = lengths.length; d >= 1; d--) {
      const key = `${d}|${level.slice(0, lengths[d - 1])}`;
      if (groups.has(key)) return key;
    }
    return "-1|";
  };
}

function sums(rows: readonly Row[], keep: (r: Row) => boolean): { n: number; s: number } {
  let n = 0, s = 0;
  for (const r of rows) if (r.y !== null && keep(r)) { n++; s += r.y; }
  return { n, s };
}

/** Out-of-fold grouped encoding: the group's other-fold sums, prior = other folds' mean; missing → that prior. */
export function groupedOutOfFold(rows: readonly Row[], groupOf: GroupOf, m: number | null): number[] {
  return rows.map((r) => {
    const all = sums(rows, (o) => o.fold !== r.fold);
    const prior = all.s / all.n;
    if (r.level === null) return prior;
    const g = groupOf(r.level);
    const own = sums(rows, (o) => o.fold !== r.fold && o.level !== null && groupOf(o.level) === g);
    return estimate(own.s, own.n, m, prior);
  });
}

/** Scoring: the group's full training sums, prior p; missing → p. */
export function groupedFull(train: readonly Row[], groupOf: GroupOf, m: number | null, p: number, levels: readonly Cell[]): number[] {
  return levels.map((level) => {
    if (level === null) return p;
    const g = groupOf(level);
    const own = sums(train, (o) => o.level !== null && groupOf(o.level) === g);
    return estimate(own.s, own.n, m, p);
  });
}

/** Hierarchical prior with fixed weights: parent mean toward `prior`, level toward the parent mean. */
function hierarchical(train: readonly Row[], level: string, length: number, w: { weight: number | null; parentWeight: number | null }, prior: number): number {
  const parent = sums(train, (o) => o.level !== null && o.level.slice(0, length) === level.slice(0, length));
  const parentMean = estimate(parent.s, parent.n, w.parentWeight, prior);
  const own = sums(train, (o) => o.level === level);
  return estimate(own.s, own.n, w.weight, parentMean);
}

/** Out-of-fold hierarchical prior: every sum over the other folds' rows; missing → other folds' mean. */
export function hierarchicalOutOfFold(rows: readonly Row[], length: number, w: { weight: number | null; parentWeight: number | null }): number[] {
  return rows.map((r) => {
    const others = rows.filter((o) => o.fold !== r.fold);
    const all = sums(others, () => true);
    return r.level === null ? all.s / all.n : hierarchical(others, r.level, length, w, all.s / all.n);
  });
}

/** Scoring with the hierarchical prior: full training sums, prior p; missing → p. */
export function hierarchicalFull(train: readonly Row[], length: number, w: { weight: number | null; parentWeight: number | null }, p: number, levels: readonly Cell[]): number[] {
  return levels.map((level) => (level === null ? p : hierarchical(train, level, length, w, p)));
}

/** Mean binary log loss over rows with a target, p clipped to [1e-15, 1 − 1e-15] (as evidence/scoreSql). */
export function logLoss(rows: readonly Row[], pred: readonly number[]): number {
  let total = 0, n = 0;
  rows.forEach((r, k) => {
    if (r.y === null) return;
    const p = Math.min(1 - 1e-15, Math.max(1e-15, pred[k]!));
    total -= r.y * Math.log(p) + (1 - r.y) * Math.log(1 - p);
    n++;
  });
  return total / n;
}
