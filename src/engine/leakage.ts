/**
 * engine/leakage: scores the m-estimate target encoding of every column in-sample and
 * out-of-fold, from the level table alone (no row sort, no second pass over the raw rows).
 *
 * An out-of-fold encoding takes one value per (level, fold): the level's sums from the other
 * folds, shrunk toward the other folds' overall mean with weight m. Missing levels take the
 * prior (the same fallback the encoder uses). Grouping rows by encoded value gives, per column,
 * (score, positives, negatives); the Mann–Whitney U statistic (ties count one half) is summed
 * over the sorted distinct scores with a running count of negatives below (engine/formulaSql,
 * mirroring stats/aucFromGroups mannWhitneyU). For continuous targets the squared error
 * Σ(y − e)² = Σ(sum_y2 − 2·e·sum_y + n·e²) is summed the same way (as stats/rSquaredFromGroups).
 * The sums stay in SQL (groups are sized by the level table); the AUC and R² are computed from
 * them by stats/aucFromGroups aucFromU and stats/rSquaredFromGroups rSquaredFromSums (profile/targetFigures leakageMetric).
 */
import type { TargetKind } from "./target.js";
import type { Engine } from "./db.js";
import { LEVEL_TABLE } from "./aggregate.js";
import { LEVEL_TOTALS } from "./levels.js";
import { mannWhitneyUSql, mEstimateSql } from "./formulaSql.js";
import { sqlNumber } from "./sql.js";

export interface LeakageSums {
  col: number;
  /** "in" = in-sample, "oof" = out-of-fold. */
  mode: "in" | "oof";
  /** Binary: Mann–Whitney U (pairs where the positive scores higher, ties ½). */
  u: number;
  positives: number;
  negatives: number;
  /** Continuous: Σ(y − e)² over rows with a target. */
  sse: number;
  rows: number;
}

/** A weight of null is m = ∞ (no detectable spread): every level scores the prior. */
function scoredSql(weights: ReadonlyMap<number, number | null>): string {
  const values = [...weights].map(([col, m]) => `(${sqlNumber(col)}, ${m === null ? "NULL" : sqlNumber(m)}::DOUBLE)`).join(", ");
  return `w(col, m) AS (VALUES ${values}),
  ft AS (SELECT fold, n_y::DOUBLE AS fn, sum_y AS fs FROM ${LEVEL_TABLE} WHERE col = -1),
  g AS (SELECT sum(fn) AS tn, sum(fs) AS ts FROM ft),
  lv AS (
    SELECT l.col, l.level, l.fold, l.n_y::DOUBLE AS n_y, l.sum_y, l.sum_y2, t.n_y::DOUBLE AS tn_level, t.sum_y AS ts_level, w.m
    FROM ${LEVEL_TABLE} l
    JOIN ${LEVEL_TOTALS} t ON l.col = t.col AND l.level IS NOT DISTINCT FROM t.level
    JOIN w ON l.col = w.col
    WHERE l.col >= 0 AND l.n_y > 0),
  scored AS (
    SELECT lv.col, lv.n_y, lv.sum_y, lv.sum_y2,
      CASE WHEN lv.level IS NULL THEN g.ts / g.tn
           ELSE ${mEstimateSql("lv.ts_level", "lv.tn_level", "lv.m", "g.ts / g.tn")} END AS s_in,
      CASE WHEN lv.level IS NULL THEN (g.ts - ft.fs) / (g.tn - ft.fn)
           ELSE ${mEstimateSql("(lv.ts_level - lv.sum_y)", "(lv.tn_level - lv.n_y)", "lv.m", "(g.ts - ft.fs) / (g.tn - ft.fn)")} END AS s_oof
    FROM lv JOIN ft USING (fold) CROSS JOIN g)`;
}

/** In-sample and out-of-fold sums for every column in `weights` (col → m used; null = ∞). */
export async function leakageSums(engine: Engine, weights: ReadonlyMap<number, number | null>, kind: TargetKind): Promise<LeakageSums[]> {
  if (weights.size === 0) return [];
  if (kind === "continuous") {
    return engine.rows<LeakageSums>(
      `WITH ${scoredSql(weights)}
       SELECT col, 'in' AS mode, 0::DOUBLE AS u, 0::DOUBLE AS positives, 0::DOUBLE AS negatives,
              sum(sum_y2 - 2 * s_in * sum_y + n_y * s_in * s_in) AS sse, sum(n_y) AS rows FROM scored GROUP BY col
       UNION ALL
       SELECT col, 'oof', 0, 0, 0, sum(sum_y2 - 2 * s_oof * sum_y + n_y * s_oof * s_oof), sum(n_y) FROM scored GROUP BY col
       ORDER BY col, mode`, "scoring the encodings in-sample and out-of-fold");
  }
  const grouped = `SELECT col, 'in' AS mode, s_in AS score, sum(sum_y) AS pos, sum(n_y - sum_y) AS neg FROM scored GROUP BY col, s_in
       UNION ALL
       SELECT col, 'oof', s_oof, sum(sum_y), sum(n_y - sum_y) FROM scored GROUP BY col, s_oof`;
  return engine.rows<LeakageSums>(
    `WITH ${scoredSql(weights)},
     mw AS (${mannWhitneyUSql(grouped, ["col", "mode"])})
     SELECT col, mode, u, positives, negatives, 0::DOUBLE AS sse, positives + negatives AS rows FROM mw ORDER BY col, mode`,
    "scoring the encodings in-sample and out-of-fold");
}
