/**
 * engine/levels: small, bounded summaries queried from the level table, never from the raw rows.
 * Anything sized by the number of levels stays in DuckDB; only count-of-counts, top levels,
 * grouped interval inputs and per-column sums cross into JavaScript.
 */
import type { CountOfCounts } from "../stats/types.js";
import type { Engine } from "./db.js";
import { LEVEL_TABLE } from "./aggregate.js";
import { meanIntervalExcludesSql } from "./formulaSql.js";
import { sqlNumber } from "./sql.js";

export const LEVEL_TOTALS = "tailsift_level_totals";

export interface LevelRow { col: number; level: string | null; rows: number; n_y: number; sum_y: number; sum_y2: number }

export interface ColumnLevelSummary {
  col: number;
  missing: number;
  countOfCounts: CountOfCounts[];
  top: LevelRow[];
}

/**
 * Sums the level table over folds: one row per (column, level). `single_fold` is the fold that
 * holds all of the level's target rows when they sit in one fold (NULL when they span several,
 * or there are none): such a level has no other-fold rows, so its out-of-fold encoding is that
 * fold's prior in closed form (engine/leakage, evidence/groupedSql aggregate that tail by fold
 * instead of joining its rows).
 */
export async function buildLevelTotals(engine: Engine): Promise<void> {
  const inFolds = "FILTER (WHERE n_y > 0)";
  await engine.run(`CREATE OR REPLACE TEMP TABLE ${LEVEL_TOTALS} AS
    SELECT col, level, sum(rows)::BIGINT AS rows, sum(n_y)::BIGINT AS n_y, sum(sum_y)::DOUBLE AS sum_y, sum(sum_y2)::DOUBLE AS sum_y2,
      CASE WHEN min(fold) ${inFolds} = max(fold) ${inFolds} THEN min(fold) ${inFolds} END::INTEGER AS single_fold
    FROM ${LEVEL_TABLE} WHERE col >= 0 GROUP BY col, level`, "summing levels over folds");
}

/** Count-of-counts, missing rows and the top levels (by rows, ties by value) per column. */
export async function summariseLevels(engine: Engine, columnCount: number, top: number): Promise<ColumnLevelSummary[]> {
  const out: ColumnLevelSummary[] = Array.from({ length: columnCount }, (_, col) => ({ col, missing: 0, countOfCounts: [], top: [] }));
  const coc = await engine.rows<{ col: number; count: number; levels: number }>(
    `SELECT col, rows::DOUBLE AS count, count(*)::DOUBLE AS levels FROM ${LEVEL_TOTALS}
     WHERE level IS NOT NULL GROUP BY col, rows ORDER BY col, count`, "counting levels by size");
  for (const r of coc) out[r.col]?.countOfCounts.push({ count: r.count, levels: r.levels });
  const missing = await engine.rows<{ col: number; rows: number }>(
    `SELECT col, rows::DOUBLE AS rows FROM ${LEVEL_TOTALS} WHERE level IS NULL`, "counting missing values");
  for (const r of missing) { const s = out[r.col]; if (s) s.missing = r.rows; }
  const tops = await engine.rows<LevelRow>(
    topPerColumnSql(columnCount, "level IS NOT NULL", "rows DESC, level", Math.max(0, Math.floor(top))),
    "finding the top levels");
  for (const r of tops) out[r.col]?.top.push(r);
  return out;
}

const LEVEL_FIELDS = "col, level, rows::DOUBLE AS rows, n_y::DOUBLE AS n_y, sum_y, sum_y2";

/**
 * The first `limit` levels of every column by `order`. A union of per-column ORDER BY … LIMIT
 * queries lets DuckDB keep a small heap per column (about 15× faster than a window over all
 * levels on 2M levels); past 200 columns one windowed query is used instead.
 */
function topPerColumnSql(columnCount: number, where: string, order: string, limit: number): string {
  if (columnCount === 0) return `SELECT ${LEVEL_FIELDS} FROM ${LEVEL_TOTALS} WHERE false`;
  if (columnCount <= 200) {
    const parts = Array.from({ length: columnCount }, (_, col) =>
      `(SELECT ${LEVEL_FIELDS} FROM ${LEVEL_TOTALS} WHERE col = ${col} AND ${where} ORDER BY ${order} LIMIT ${limit})`);
    return `SELECT * FROM (${parts.join(" UNION ALL ")}) ORDER BY col, ${order}`;
  }
  return `SELECT ${LEVEL_FIELDS} FROM ${LEVEL_TOTALS} WHERE ${where}
    QUALIFY row_number() OVER (PARTITION BY col ORDER BY ${order}) <= ${limit} ORDER BY col, ${order}`;
}

export interface VariantSummary { col: number; groups: number; levels: number; rows: number; examples: string[][] }

/**
 * Levels that collapse to one when case-folded, trimmed and inner whitespace collapsed:
 * counts per column and up to five example groups (the largest), four spellings each.
 */
export async function findVariants(engine: Engine, cols?: readonly number[]): Promise<Map<number, VariantSummary>> {
  if (cols && cols.length === 0) return new Map();
  const only = cols ? ` AND col IN (${cols.map((c) => sqlNumber(c)).join(", ")})` : "";
  const rows = await engine.rows<{ col: number; groups: number; levels: number; rows: number; examples: string[][] }>(
    `WITH k AS (
       SELECT col, level, rows, regexp_replace(lower(trim(level)), '\\s+', ' ', 'g') AS key
       FROM ${LEVEL_TOTALS} WHERE level IS NOT NULL${only}),
     dup AS (SELECT col, key FROM k GROUP BY col, key HAVING count(*) > 1),
     g AS (
       SELECT k.col, k.key, count(*) AS levels, sum(k.rows) AS rows, list(k.level ORDER BY k.rows DESC, k.level)[1:4] AS spellings
       FROM k JOIN dup ON k.col = dup.col AND k.key = dup.key GROUP BY k.col, k.key)
     SELECT col, count(*)::DOUBLE AS groups, sum(levels)::DOUBLE AS levels, sum(rows)::DOUBLE AS rows,
            list(spellings ORDER BY rows DESC, key)[1:5] AS examples
     FROM g GROUP BY col`, "looking for spelling variants");
  return new Map(rows.map((r) => [r.col, r]));
}

export interface TargetColumnSums {
  col: number;
  levels: number;
  rows: number;
  sumY: number;
  sumY2: number;
  /** Σ sum_yᵢ² / nᵢ over levels with a target. */
  sumSumSqOverRows: number;
  /** Σ nᵢ² over levels with a target. */
  sumRowsSq: number;
}

/** Per-column sums over levels with at least one target value (missing level included as a level). */
export async function targetColumnSums(engine: Engine): Promise<Map<number, TargetColumnSums>> {
  const rows = await engine.rows<TargetColumnSums>(
    `SELECT col, count(*)::DOUBLE AS levels, sum(n_y)::DOUBLE AS rows, sum(sum_y) AS sumY, sum(sum_y2) AS sumY2,
            sum(sum_y * sum_y / n_y) AS sumSumSqOverRows, sum(n_y::DOUBLE * n_y) AS sumRowsSq
     FROM ${LEVEL_TOTALS} WHERE n_y > 0 GROUP BY col`, "summing the target by level");
  return new Map(rows.map((r) => [r.col, r]));
}

export interface IntervalGroup { col: number; n: number; sumY: number; sumY2: number; levels: number }

/**
 * Binary target: levels grouped by (n, positives) — the Wilson interval depends on nothing else,
 * so the number of groups stays small even for millions of levels.
 */
export async function binaryIntervalGroups(engine: Engine): Promise<IntervalGroup[]> {
  return engine.rows<IntervalGroup>(
    `SELECT col, n_y::DOUBLE AS n, sum_y AS sumY, 0::DOUBLE AS sumY2, count(*)::DOUBLE AS levels
     FROM ${LEVEL_TOTALS} WHERE n_y > 0 AND level IS NOT NULL GROUP BY col, n_y, sum_y ORDER BY col, n, sumY`,
    "grouping levels for intervals");
}

/**
 * Continuous target: per column, the levels (n ≥ 2) whose t interval excludes `overallMean`, and
 * the levels tested. Counted in SQL; only the distinct level sizes (≈ √(2N) at most) cross into
 * JavaScript, to get the t quantile of each from stats/.
 */
export async function continuousFlagCounts(
  engine: Engine, overallMean: number, factorFor: (n: number) => number,
): Promise<Map<number, { flagged: number; tested: number }>> {
  const sizes = await engine.rows<{ n: number }>(
    `SELECT DISTINCT n_y::DOUBLE AS n FROM ${LEVEL_TOTALS} WHERE n_y >= 2 AND level IS NOT NULL ORDER BY n`, "listing level sizes");
  if (sizes.length === 0) return new Map();
  const factors = sizes.map((r) => `(${sqlNumber(r.n)}::DOUBLE, ${sqlNumber(factorFor(r.n))}::DOUBLE)`).join(", ");
  const excludes = meanIntervalExcludesSql("t.n_y::DOUBLE", "t.sum_y", "t.sum_y2", "f.factor", `${sqlNumber(overallMean)}::DOUBLE`);
  const rows = await engine.rows<{ col: number; flagged: number; tested: number }>(
    `SELECT t.col, count(*) FILTER (WHERE ${excludes})::DOUBLE AS flagged, count(*)::DOUBLE AS tested
     FROM ${LEVEL_TOTALS} t JOIN (VALUES ${factors}) f(n, factor) ON t.n_y::DOUBLE = f.n
     WHERE t.n_y >= 2 AND t.level IS NOT NULL GROUP BY t.col`, "counting levels whose interval excludes the mean");
  return new Map(rows.map((r) => [r.col, { flagged: r.flagged, tested: r.tested }]));
}

/** Up to `limit` levels per column for the funnel plot (the largest by target rows). */
export async function funnelLevels(engine: Engine, columnCount: number, limit: number): Promise<LevelRow[]> {
  return engine.rows<LevelRow>(topPerColumnSql(columnCount, "n_y > 0 AND level IS NOT NULL", "n_y DESC, level", Math.floor(limit)),
    "choosing levels for the funnel plot");
}
