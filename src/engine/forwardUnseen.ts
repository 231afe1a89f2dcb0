/**
 * engine/forwardUnseen: the unseen-level share measured forward over time-ordered blocks (fold
 * kind time-blocks, engine/folds): for each block b = 1..K−1, the share of block b's non-missing
 * rows whose level appears in no block before b. Read from the level table's (col, level, fold)
 * rows in one query: a level's first block is min(fold); its rows in block b are unseen when that
 * first block is b. Only (col, block, rows, unseen) — K − 1 rows per column — cross into
 * JavaScript; stats/stepMean turns the step shares into their mean and standard error.
 */
import type { Engine } from "./db.js";
import { LEVEL_TABLE } from "./passPlan.js";
import { stepMean } from "../stats/stepMean.js";

export interface ForwardUnseenStep { block: number; rows: number; unseen: number }

export interface ForwardUnseen {
  /** Per block b ≥ 1 with non-missing rows: its rows and those whose level no earlier block has. */
  steps: ForwardUnseenStep[];
  /** Mean of the step shares unseen/rows and its standard error (null with one step). */
  mean: number;
  se: number | null;
  /** The share in the last block (fit on every earlier block). */
  last: number;
}

/** The per-step sums of every level column (col ≥ 0), in one query over the level table. */
export async function forwardUnseenSteps(engine: Engine): Promise<Map<number, ForwardUnseenStep[]>> {
  const rows = await engine.rows<{ col: number; block: number; rows: number; unseen: number }>(
    `WITH lf AS (SELECT col, level, fold, sum(rows)::DOUBLE AS rows FROM ${LEVEL_TABLE} WHERE col >= 0 AND level IS NOT NULL GROUP BY col, level, fold),
       fl AS (SELECT col, level, min(fold) AS first_block FROM lf GROUP BY col, level)
     SELECT lf.col::INTEGER AS col, lf.fold::INTEGER AS block, sum(lf.rows)::DOUBLE AS rows,
       coalesce(sum(lf.rows) FILTER (WHERE fl.first_block = lf.fold), 0)::DOUBLE AS unseen
     FROM lf JOIN fl ON lf.col = fl.col AND lf.level = fl.level
     WHERE lf.fold >= 1 GROUP BY lf.col, lf.fold ORDER BY col, block`, "measuring the forward unseen-level share");
  const out = new Map<number, ForwardUnseenStep[]>();
  for (const r of rows) {
    const list = out.get(r.col) ?? [];
    if (r.rows > 0) list.push({ block: r.block, rows: r.rows, unseen: r.unseen });
    out.set(r.col, list);
  }
  return out;
}

/** The figure of one column from its steps (null without a step). */
export function forwardUnseenFigure(steps: readonly ForwardUnseenStep[]): ForwardUnseen | null {
  const m = stepMean(steps.map((s) => s.unseen / s.rows));
  return m && { steps: [...steps], mean: m.mean, se: m.se, last: m.last };
}
