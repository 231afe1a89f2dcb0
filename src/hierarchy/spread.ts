/**
 * hierarchy/spread: with a target, does a candidate parent explain part of the between-level
 * spread of the target? One-way analysis of the level means grouped by parent, each level one
 * observation weighted by its target rows (computed in DuckDB over every level):
 *   SSL = Σ_levels n_l (ȳ_l − ȳ)²        (the spread of the level means, K − 1 df)
 *   SSP = Σ_parents n_p (ȳ_p − ȳ)²       (its part between parents, G − 1 df)
 *   MS_within = (SSL − SSP) / (K − G)     (levels within a parent)
 *   F = (SSP / (G − 1)) / MS_within, on (G − 1, K − G) df — in a nested design the mean square of
 *     the higher level is tested over that of the subgroups within it (Sokal & Rohlf, Biometry,
 *     3rd ed. 1995, ch. 10, nested ANOVA); with unequal level sizes the F reference is approximate;
 *   share = (SSP − (G − 1)·MS_within) / SSL — the parents' share of the level means' spread,
 *     corrected for what a grouping of unrelated levels gets by chance (Kelley's ε², Kelley 1935,
 *     "An unbiased correlation ratio measure", PNAS 21: 554–559).
 * A parent groups (PARENT_P and PARENT_SHARE both met) when F is beyond chance at the 1 % level
 * and the share is at least 0.01, Cohen's "small" η² (Cohen 1988, Statistical Power Analysis for
 * the Behavioral Sciences, 2nd ed., ch. 8 — recalled from memory). The share threshold is low on
 * purpose: the level means of rare levels are mostly noise, so even a real parent explains a small
 * share of their spread; the F test carries the "beyond chance" part.
 */
import type { Engine } from "../engine/db.js";
import { LEVEL_TOTALS } from "../engine/levels.js";
import { sqlNumber } from "../engine/sql.js";
import { regularizedIncompleteBeta } from "../stats/regularizedIncompleteBeta.js";
import { parentSql } from "./parent.js";
import type { ParentSpec, ParentSpread } from "./types.js";

export const PARENT_P = 0.01;
export const PARENT_SHARE = 0.01;

/** Upper tail P(F ≥ f) of the F distribution on (d1, d2) df, by the incomplete beta (Numerical Recipes §6.14). */
export function fUpperTail(f: number, d1: number, d2: number): number {
  if (!(f > 0)) return 1;
  if (!Number.isFinite(f)) return 0;
  const x = d2 / (d2 + d1 * f);
  return regularizedIncompleteBeta(x, d2 / 2, d1 / 2).lower;
}

/** The figures from the sums of squares (exported for tests). Edge cases: K ≤ G, G < 2 or SSL = 0 → null. */
export function spreadFromSums(ssl: number, ssp: number, levels: number, groups: number): ParentSpread | null {
  if (groups < 2 || levels <= groups || !(ssl > 0)) return null;
  const msWithin = Math.max(0, ssl - ssp) / (levels - groups);
  const f = msWithin > 0 ? ssp / (groups - 1) / msWithin : Infinity;
  const share = (ssp - (groups - 1) * msWithin) / ssl;
  const p = fUpperTail(f, groups - 1, levels - groups);
  return { share, f: Number.isFinite(f) ? f : null, p, groups: share >= PARENT_SHARE && p <= PARENT_P };
}

/**
 * One entry per parent, in the order given; null for every parent when the column has no target
 * rows (no target), and null for a parent whose figures are undefined (see spreadFromSums).
 */
export async function parentSpread(engine: Engine, col: number, parents: readonly ParentSpec[]): Promise<(ParentSpread | null)[] | null> {
  if (parents.length === 0) return [];
  const grouped = parents.map((p, i) => `SELECT ${i} AS i, ${parentSql(p, "level")} AS parent, sum(n) AS n, sum(s) AS s FROM lv GROUP BY 1, 2`).join(" UNION ALL ");
  const rows = await engine.rows<{ i: number; ssp: number; groups: number; ssl: number; levels: number }>(
    `WITH lv AS (SELECT level, n_y::DOUBLE AS n, sum_y AS s FROM ${LEVEL_TOTALS} WHERE col = ${sqlNumber(col)} AND level IS NOT NULL AND n_y > 0),
          g AS (SELECT sum(s) / sum(n) AS mean, sum(n * (s / n - (SELECT sum(s) / sum(n) FROM lv)) ** 2) AS ssl, count(*)::DOUBLE AS levels FROM lv),
          p AS (${grouped})
     SELECT i, sum(n * (s / n - g.mean) ** 2) AS ssp, count(*)::DOUBLE AS groups, any_value(g.ssl) AS ssl, any_value(g.levels) AS levels
     FROM p CROSS JOIN g GROUP BY i ORDER BY i`, "measuring how parents split the target");
  if (rows.length === 0) return null;
  return parents.map((_, i) => {
    const r = rows.find((x) => x.i === i);
    return r ? spreadFromSums(r.ssl, r.ssp, r.levels, r.groups) : null;
  });
}
