/**
 * evidence/hierarchicalSql: out-of-fold predictions of the hierarchical prior. For a row of level
 * i with parent p in fold f, with every sum taken over the other folds:
 *   parent_f = (S_p + M_f·prior_f)/(N_p + M_f),   pred = (s_i + m_f·parent_f)/(n_i + m_f),
 * where M_f and m_f are the fold's fitted weights (hierarchicalWeights). A null weight means no
 * detectable spread at that level: the group takes its prior (parent_f = prior_f, or
 * pred = parent_f). A level or parent with no rows in the other folds takes its prior too;
 * missing values take prior_f.
 */
import { sqlNumber } from "../engine/sql.js";
import { parentSql } from "../hierarchy/parent.js";
import type { ParentSpec } from "../hierarchy/types.js";
import { baseCtes, mEstimateSql } from "./baseSql.js";
import type { FoldWeights } from "./hierarchicalWeights.js";

const weightSql = (w: number | null) => (w === null ? "NULL::DOUBLE" : `${sqlNumber(w)}::DOUBLE`);

/** The (fold, n, s, s2, pred) query; `weights` must hold every fold of the level table. */
export function hierarchicalScoredSql(col: number, parent: ParentSpec, weights: readonly FoldWeights[]): string {
  const values = weights.filter((w) => w.fold >= 0)
    .map((w) => `(${sqlNumber(w.fold)}::INTEGER, ${weightSql(w.parentWeight)}, ${weightSql(w.levelWeight)})`).join(", ");
  return `WITH ${baseCtes(col)},
  w(fold, pw, lw) AS (VALUES ${values || "(NULL::INTEGER, NULL::DOUBLE, NULL::DOUBLE)"}),
  lt AS (SELECT level, sum(n) AS tn, sum(s) AS ts FROM lf WHERE level IS NOT NULL GROUP BY level),
  lp AS (SELECT lf.*, lt.tn, lt.ts, ${parentSql(parent, "lf.level")} AS parent FROM lf LEFT JOIN lt ON lf.level = lt.level),
  pt AS (SELECT parent, sum(n) AS pn, sum(s) AS ps FROM lp WHERE level IS NOT NULL GROUP BY parent),
  pft AS (SELECT parent, fold, sum(n) AS pnf, sum(s) AS psf FROM lp WHERE level IS NOT NULL GROUP BY parent, fold),
  x AS (SELECT lp.*, pf.prior, w.pw, w.lw, pt.pn - pft.pnf AS pno, pt.ps - pft.psf AS pso
        FROM lp JOIN pf USING (fold) LEFT JOIN w USING (fold)
        LEFT JOIN pt ON pt.parent = lp.parent LEFT JOIN pft ON pft.parent = lp.parent AND pft.fold = lp.fold),
  y AS (SELECT *, ${mEstimateSql("pso", "pno", "pw", "prior")} AS pmean FROM x)
  SELECT fold, n, s, s2, CASE WHEN level IS NULL THEN prior ELSE ${mEstimateSql("(ts - s)", "(tn - n)", "lw", "pmean")} END AS pred FROM y`;
}
