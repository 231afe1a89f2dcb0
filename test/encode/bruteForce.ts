/**
 * Brute-force references for every encoding, in plain TypeScript over parsed rows: loops only,
 * no SQL and no code shared with src/encode. Each target value is recomputed row by row from
 * the definition (m-estimate, Cestnik 1990: (sum + m·prior)/(n + m)).
 */
import type { Cell } from "./helpers.js";

const mean = (ys: readonly (number | null)[]) => {
  let n = 0;
  let s = 0;
  for (const y of ys) if (y !== null) { n++; s += y; }
  return s / n;
};

/**
 * Out-of-fold: for row r in fold f, the sums over rows of OTHER folds with the same level, and
 * the prior = mean target of the other folds (all levels); missing level → that prior.
 */
export function outOfFold(levels: readonly Cell[], ys: readonly (number | null)[], folds: readonly number[], m: number): number[] {
  const overall = mean(ys);
  return levels.map((level, r) => {
    let n = 0, s = 0, nAll = 0, sAll = 0;
    for (let j = 0; j < levels.length; j++) {
      const y = ys[j];
      if (folds[j] === folds[r] || y === null || y === undefined) continue;
      nAll++; sAll += y;
      if (level !== null && levels[j] === level) { n++; s += y; }
    }
    const prior = nAll > 0 ? sAll / nAll : overall;
    if (level === null || n + m <= 0) return prior;
    return (s + m * prior) / (n + m);
  });
}

/** Leave-one-out: (S − y + m·p)/(N − 1 + m) over the row's level; N − 1 + m ≤ 0 → p; missing → p. */
export function leaveOneOut(levels: readonly Cell[], ys: readonly (number | null)[], m: number): number[] {
  const p = mean(ys);
  return levels.map((level, r) => {
    if (level === null) return p;
    let n = 0, s = 0;
    for (let j = 0; j < levels.length; j++) {
      const y = ys[j];
      if (levels[j] === level && y !== null && y !== undefined) { n++; s += y; }
    }
    const y = ys[r] ?? null;
    if (y === null) return n + m <= 0 ? p : (s + m * p) / (n + m);
    return n - 1 + m <= 0 ? p : (s - y + m * p) / (n - 1 + m);
  });
}

/** Scoring: the full training data's m-estimate per level; unseen and missing → p. */
export function fullData(trainLevels: readonly Cell[], trainYs: readonly (number | null)[], p: number, m: number, levels: readonly Cell[]): number[] {
  return levels.map((level) => {
    if (level === null) return p;
    let n = 0, s = 0;
    for (let j = 0; j < trainLevels.length; j++) {
      const y = trainYs[j];
      if (trainLevels[j] === level && y !== null && y !== undefined) { n++; s += y; }
    }
    return n + m <= 0 ? p : (s + m * p) / (n + m);
  });
}

/** Training share of each level (rows / all training rows); unseen and missing → 0. */
export function frequency(trainLevels: readonly Cell[], levels: readonly Cell[]): number[] {
  return levels.map((level) => {
    if (level === null) return 0;
    let n = 0;
    for (const t of trainLevels) if (t === level) n++;
    return n / trainLevels.length;
  });
}

/** Codes: rank by descending training rows, ties by UTF-8 byte order; rank > tableSize, unseen, missing → 0. */
export function codes(trainLevels: readonly Cell[], levels: readonly Cell[], tableSize: number): number[] {
  const counts = new Map<string, number>();
  for (const t of trainLevels) if (t !== null) counts.set(t, (counts.get(t) ?? 0) + 1);
  const ranked = [...counts.keys()].sort((a, b) => (counts.get(b)! - counts.get(a)!) || Buffer.compare(Buffer.from(a), Buffer.from(b)));
  return levels.map((level) => {
    const rank = level === null ? -1 : ranked.indexOf(level) + 1;
    return rank >= 1 && rank <= tableSize ? rank : 0;
  });
}

/** 1 when the level equals `one`, else 0. */
export const indicator = (levels: readonly Cell[], one: string | null) => levels.map((l) => (l === one ? 1 : 0));

/** One 0/1 vector per listed level. */
export const oneHot = (levels: readonly Cell[], list: readonly string[]) => list.map((v) => levels.map((l) => (l === v ? 1 : 0)));

/** The "other" column of pooled one-hot: 1 for a non-missing level not kept. */
export const pooledOther = (levels: readonly Cell[], keep: readonly string[]) => levels.map((l) => (l !== null && !keep.includes(l) ? 1 : 0));
