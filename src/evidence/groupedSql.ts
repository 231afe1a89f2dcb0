/**
 * evidence/groupedSql: out-of-fold predictions for every candidate that maps each level to a
 * group and predicts the group's smoothed mean: the overall mean (no groups), pooled one-hot
 * (kept levels + "other", raw group rates, m = 0), target-kfold (each level its own group, the
 * fitted m) and backoff (groups from the backoff mapping, m fitted on the groups). For a row in
 * fold f the group's sums come from the other folds only:
 *   pred = (S_g − S_g,f + m·prior_f) / (N_g − N_g,f + m),
 * or prior_f when the group has no rows in the other folds or m is null (no detectable spread
 * between groups), and prior_f for missing values and unmapped levels — the fallback encode uses.
 */
import { sqlNumber } from "../engine/sql.js";
import { baseCtes, mEstimateSql } from "./baseSql.js";

/**
 * A mapping is a query of (level, gd, gk) for non-missing levels — gd/gk identify the group (see
 * hierarchy/backoff) — or "identity" (each level its own group) or "none" (no groups).
 */
export type GroupMapping = "identity" | "none" | { sql: string };

/** The (fold, n, s, s2, pred) query of a grouped candidate with weight m ≥ 0 (null = infinite: every group takes the prior). */
export function groupedScoredSql(col: number, mapping: GroupMapping, weight: number | null): string {
  const m = weight === null ? "NULL::DOUBLE" : `${sqlNumber(weight)}::DOUBLE`;
  const lg = mapping === "identity"
    ? "SELECT lf.*, CASE WHEN level IS NULL THEN NULL ELSE 0 END AS gd, level AS gk FROM lf"
    : mapping === "none"
      ? "SELECT lf.*, NULL::INTEGER AS gd, NULL::VARCHAR AS gk FROM lf"
      : `SELECT lf.*, mp.gd, mp.gk FROM lf LEFT JOIN (${mapping.sql}) mp ON lf.level = mp.level`;
  return `WITH ${baseCtes(col)},
  lg AS (${lg}),
  gt AS (SELECT gd, gk, sum(n) AS gn, sum(s) AS gs FROM lg WHERE gd IS NOT NULL GROUP BY gd, gk),
  gft AS (SELECT gd, gk, fold, sum(n) AS gnf, sum(s) AS gsf FROM lg WHERE gd IS NOT NULL GROUP BY gd, gk, fold)
  SELECT lg.fold, lg.n, lg.s, lg.s2,
    CASE WHEN lg.gd IS NULL THEN pf.prior ELSE ${mEstimateSql("(gt.gs - gft.gsf)", "(gt.gn - gft.gnf)", m, "pf.prior")} END AS pred
  FROM lg JOIN pf USING (fold)
  LEFT JOIN gt ON gt.gd = lg.gd AND gt.gk = lg.gk
  LEFT JOIN gft ON gft.gd = lg.gd AND gft.gk = lg.gk AND gft.fold = lg.fold`;
}
