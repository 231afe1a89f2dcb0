/**
 * engine/forwardLeakage: the m-estimate target encoding of every column scored forward over
 * time-ordered blocks (fold kind time-blocks, --time), from the level table alone: a row of block
 * b ≥ 1 gets its level's sums over blocks < b, shrunk with weight m toward the mean of blocks < b
 * (a level no earlier block has takes that mean, as encode's fallback; missing values too). The
 * cumulative sums are window sums over each level's (level, fold) rows ordered by fold, so there is
 * no level × block cross product. Block 0 is fit-only (nothing before it). Binary targets: the
 * Mann–Whitney U of the forward scores (engine/formulaSql mannWhitneyUSql, as engine/leakage);
 * continuous: SSE and SST of the scored rows. Only per-column sums cross into JavaScript.
 */
import type { Engine } from "./db.js";
import { EARLIER_FOLDS, mannWhitneyUSql, mEstimateSql } from "./formulaSql.js";
import { LEVEL_TABLE } from "./passPlan.js";
import { sqlNumber } from "./sql.js";
import type { TargetKind } from "./target.js";

export interface ForwardLeakageSums { col: number; u: number; positives: number; negatives: number; sse: number; sst: number; rows: number }

function scoredSql(weights: ReadonlyMap<number, number | null>): string {
  const values = [...weights].map(([col, m]) => `(${sqlNumber(col)}, ${m === null ? "NULL" : sqlNumber(m)}::DOUBLE)`).join(", ");
  return `w(col, m) AS (VALUES ${values}),
  ft AS (SELECT fold, sum(n_y)::DOUBLE AS fn, sum(sum_y)::DOUBLE AS fs FROM ${LEVEL_TABLE} WHERE col = -1 GROUP BY fold),
  fc AS (SELECT fold, sum(fn) OVER (${EARLIER_FOLDS}) AS pn, sum(fs) OVER (${EARLIER_FOLDS}) AS ps FROM ft),
  lv AS (SELECT l.col, l.level, l.fold, sum(l.n_y)::DOUBLE AS n_y, sum(l.sum_y)::DOUBLE AS sum_y, sum(l.sum_y2)::DOUBLE AS sum_y2
         FROM ${LEVEL_TABLE} l JOIN w ON l.col = w.col WHERE l.col >= 0 AND l.n_y > 0 GROUP BY l.col, l.level, l.fold),
  lc AS (SELECT lv.*, coalesce(sum(n_y) OVER (PARTITION BY col, level ${EARLIER_FOLDS}), 0) AS cn,
                coalesce(sum(sum_y) OVER (PARTITION BY col, level ${EARLIER_FOLDS}), 0) AS cs FROM lv),
  scored AS (
    SELECT lc.col, lc.n_y, lc.sum_y, lc.sum_y2,
      CASE WHEN lc.level IS NULL THEN fc.ps / fc.pn ELSE ${mEstimateSql("lc.cs", "lc.cn", "w.m", "fc.ps / fc.pn")} END AS s_fwd
    FROM lc JOIN fc ON lc.fold = fc.fold JOIN w ON lc.col = w.col WHERE lc.fold >= 1 AND fc.pn > 0)`;
}

/** Forward sums for every column in `weights` (col → m; null = ∞). */
export async function forwardLeakageSums(engine: Engine, weights: ReadonlyMap<number, number | null>, kind: TargetKind): Promise<ForwardLeakageSums[]> {
  if (weights.size === 0) return [];
  if (kind === "continuous") {
    return engine.rows<ForwardLeakageSums>(
      `WITH ${scoredSql(weights)}
       SELECT col, 0::DOUBLE AS u, 0::DOUBLE AS positives, 0::DOUBLE AS negatives,
              sum(sum_y2 - 2 * s_fwd * sum_y + n_y * s_fwd * s_fwd)::DOUBLE AS sse,
              (sum(sum_y2) - sum(sum_y) * sum(sum_y) / sum(n_y))::DOUBLE AS sst, sum(n_y)::DOUBLE AS rows
       FROM scored GROUP BY col ORDER BY col`, "scoring the encodings forward in time");
  }
  return engine.rows<ForwardLeakageSums>(
    `WITH ${scoredSql(weights)},
     mw AS (${mannWhitneyUSql("SELECT col, s_fwd AS score, sum(sum_y) AS pos, sum(n_y - sum_y) AS neg FROM scored GROUP BY col, s_fwd", ["col"])})
     SELECT col, u, positives, negatives, 0::DOUBLE AS sse, 0::DOUBLE AS sst, positives + negatives AS rows FROM mw ORDER BY col`,
    "scoring the encodings forward in time");
}
