/**
 * engine/wideSample: the first-rows sample of engine/inspect for wide inputs in ONE query. The
 * sampled rows are unnested into (col, value) — as in the wide pass — and counted per column, so a
 * wide CSV is read (and sniffed) once instead of once per batch of 200 columns; values are first
 * grouped per (col, value), so the patterns are matched once per distinct value. The counts are the
 * ones inspect's batched query takes over the same LIMIT subquery: non-missing values, values that
 * match the number pattern, the integer pattern (inspect's, at most 18 digits: also the integers
 * encode may write as BIGINT) and the time forms (engine/timeColumns), distinct
 * values, and the rows sampled.
 */
import type { Engine } from "./db.js";
import { quoteIdent, quoteLiteral, sqlNumber } from "./sql.js";

export interface SampleCounts { nonMissing: number; numberLike: number; distinct: number; integerLike: number; timeLike: number; sampledRows: number }

export interface SamplePatterns {
  number: string;
  integer: string;
  /** SQL of the TIMESTAMP a text expression reads as, or NULL (engine/timeColumns timeValueSql). */
  time: (text: string) => string;
}

export async function sampleCountsUnnested(
  engine: Engine, view: string, columns: readonly string[], sampleRows: number, patterns: SamplePatterns,
): Promise<SampleCounts[]> {
  const out: SampleCounts[] = columns.map(() => ({ nonMissing: 0, numberLike: 0, distinct: 0, integerLike: 0, timeLike: 0, sampledRows: 0 }));
  if (columns.length === 0) return out;
  const cols = columns.map((_, i) => sqlNumber(i)).join(", ");
  const values = columns.map(quoteIdent).join(", ");
  const rows = await engine.rows<{ col: number; n: number; k: number; d: number; i: number; t: number; r: number }>(
    `SELECT col, coalesce(sum(c) FILTER (WHERE v IS NOT NULL), 0)::DOUBLE AS n,
            coalesce(sum(c) FILTER (WHERE regexp_full_match(v, ${quoteLiteral(patterns.number)})), 0)::DOUBLE AS k, count(v)::DOUBLE AS d,
            coalesce(sum(c) FILTER (WHERE regexp_full_match(v, ${quoteLiteral(patterns.integer)})), 0)::DOUBLE AS i,
            coalesce(sum(c) FILTER (WHERE ${patterns.time("v")} IS NOT NULL), 0)::DOUBLE AS t,
            coalesce(sum(c), 0)::DOUBLE AS r
     FROM (SELECT col, v, count(*) AS c
           FROM (SELECT unnest([${cols}])::INTEGER AS col, unnest([${values}]::VARCHAR[]) AS v
                 FROM (SELECT * FROM ${view} LIMIT ${sqlNumber(sampleRows)}))
           GROUP BY col, v)
     GROUP BY col`, "sampling the first rows");
  for (const r of rows) {
    const o = out[r.col];
    if (o) { o.nonMissing = r.n; o.numberLike = r.k; o.distinct = r.d; o.integerLike = r.i; o.timeLike = r.t; o.sampledRows = r.r; }
  }
  return out;
}
