/**
 * Row-by-row out-of-fold predictions for the evidence tests: plain loops over the rows, with the
 * folds scan assigns read back through foldSql. Nothing here reads the level table.
 */
import type { ParentSpec } from "../../src/hierarchy/types.js";
import { parentOf } from "../../src/hierarchy/parent.js";
import { betaBinomialPriorWeight } from "../../src/stats/betaBinomialPriorWeight.js";
import { normalNormalPriorWeight } from "../../src/stats/normalNormalPriorWeight.js";
import { nestedPriorWeight } from "../../src/stats/nestedPriorWeight.js";

export interface Row { level: string | null; y: number; fold: number }

const sum = (xs: readonly number[]) => xs.reduce((a, b) => a + b, 0);
/** m-estimate; an unseen group (n = 0) or an infinite weight (null) gives the prior (stats/mEstimate's policy). */
const estimate = (s: number, n: number, m: number | null, prior: number) => (m === null || n === 0 ? prior : (s + m * prior) / (n + m));

/** Groups rows by key: n, Σy, Σy². */
export function sums(rows: readonly Row[], key: (r: Row) => string): Map<string, { n: number; s: number; s2: number }> {
  const out = new Map<string, { n: number; s: number; s2: number }>();
  for (const r of rows) {
    const k = key(r);
    const g = out.get(k) ?? { n: 0, s: 0, s2: 0 };
    out.set(k, { n: g.n + 1, s: g.s + r.y, s2: g.s2 + r.y * r.y });
  }
  return out;
}

/** The flat prior's estimator on groups (beta-binomial moments or DerSimonian–Laird), as profile/targetFigures fits it. */
export function fitGroups(groups: Map<string, { n: number; s: number; s2: number }>, binary: boolean): number | null {
  const g = [...groups.values()];
  const totals = { levels: g.length, rows: sum(g.map((x) => x.n)), sumSq: sum(g.map((x) => (x.s * x.s) / x.n)), nn: sum(g.map((x) => x.n * x.n)) };
  if (totals.levels < 2) return null;
  return binary
    ? betaBinomialPriorWeight({ levels: totals.levels, rows: totals.rows, positives: sum(g.map((x) => x.s)), sumPositivesSqOverRows: totals.sumSq, sumRowsSq: totals.nn }).weight
    : normalNormalPriorWeight({ levels: totals.levels, rows: totals.rows, sumY: sum(g.map((x) => x.s)), sumY2: sum(g.map((x) => x.s2)), sumSumSqOverRows: totals.sumSq, sumRowsSq: totals.nn }).weight;
}

/** Grouped m-estimate: group(level) → key (null = no group: the prior). */
export function groupedOof(rows: readonly Row[], group: (level: string) => string | null, m: number | null): number[] {
  return rows.map((r) => {
    const train = rows.filter((o) => o.fold !== r.fold);
    const prior = sum(train.map((o) => o.y)) / train.length;
    const key = r.level === null ? null : group(r.level);
    if (key === null) return prior;
    const same = train.filter((o) => o.level !== null && group(o.level) === key);
    return estimate(sum(same.map((o) => o.y)), same.length, m, prior);
  });
}

/** Hierarchical prior, both weights fitted on the other folds' rows. */
export function hierarchicalOof(rows: readonly Row[], parent: ParentSpec, binary: boolean): number[] {
  const fits = new Map<number, { pw: number | null; lw: number | null }>();
  for (const fold of new Set(rows.map((r) => r.fold))) {
    const train = rows.filter((o) => o.fold !== fold && o.level !== null);
    const parents = sums(train, (o) => parentOf(parent, o.level!));
    const levels = sums(train, (o) => o.level!);
    let nested = 0;
    for (const [p, g] of parents) nested += sum([...levels].filter(([l]) => parentOf(parent, l) === p).map(([, x]) => x.n * x.n)) / g.n;
    const lw = nestedPriorWeight({
      rows: train.length, levels: levels.size, parents: parents.size, sumY2: sum(train.map((o) => o.y * o.y)),
      levelSumSqOverRows: sum([...levels.values()].map((x) => (x.s * x.s) / x.n)),
      parentSumSqOverRows: sum([...parents.values()].map((x) => (x.s * x.s) / x.n)), nestedRowsSq: nested,
    }).weight;
    fits.set(fold, { pw: fitGroups(parents, binary), lw });
  }
  return rows.map((r) => {
    const train = rows.filter((o) => o.fold !== r.fold);
    const prior = sum(train.map((o) => o.y)) / train.length;
    if (r.level === null) return prior;
    const { pw, lw } = fits.get(r.fold)!;
    const p = parentOf(parent, r.level);
    const inParent = train.filter((o) => o.level !== null && parentOf(parent, o.level) === p);
    const pmean = estimate(sum(inParent.map((o) => o.y)), inParent.length, pw, prior);
    const same = train.filter((o) => o.level === r.level);
    return estimate(sum(same.map((o) => o.y)), same.length, lw, pmean);
  });
}

/** Per-row loss, per-fold means, pooled mean and sd/√K; AUC by all pairs (ties ½) or R². */
export function scoreRows(rows: readonly Row[], pred: readonly number[], binary: boolean) {
  const clip = (p: number) => Math.min(1 - 1e-15, Math.max(1e-15, p));
  const loss = rows.map((r, i) => (binary ? -(r.y * Math.log(clip(pred[i]!)) + (1 - r.y) * Math.log(1 - clip(pred[i]!))) : (r.y - pred[i]!) ** 2));
  const folds = [...new Set(rows.map((r) => r.fold))].sort((a, b) => a - b);
  const foldLosses = folds.map((f) => { const l = loss.filter((_, i) => rows[i]!.fold === f); return sum(l) / l.length; });
  const mean = sum(foldLosses) / folds.length;
  const se = Math.sqrt(sum(foldLosses.map((x) => (x - mean) ** 2)) / (folds.length - 1) / folds.length);
  let wins = 0;
  let pairs = 0;
  if (binary) rows.forEach((a, i) => rows.forEach((b, j) => { if (a.y === 1 && b.y === 0) { pairs++; wins += pred[i]! > pred[j]! ? 1 : pred[i] === pred[j] ? 0.5 : 0; } }));
  const ybar = sum(rows.map((r) => r.y)) / rows.length;
  const r2 = 1 - sum(loss) / sum(rows.map((r) => (r.y - ybar) ** 2));
  return { loss: sum(loss) / rows.length, foldLosses, se, auc: binary ? wins / pairs : undefined, r2: binary ? undefined : r2 };
}
