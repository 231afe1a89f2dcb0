/**
 * engine/wideSample: the first-rows sample of engine/inspect for wide inputs in ONE query. The
 * sampled rows are unnested into (col, value) — as in the wide pass — and counted per column, so a
 * wide CSV is read (and sniffed) once instead of once per batch of 200 columns; values are first
 * grouped per (col, value), so the number pattern is matched once per distinct value. The counts are the
 * ones inspect's batched query takes over the same LIMIT subquery: non-missing values, values that
 * match the number pattern, values that match the integer pattern and distinct values.
 */
import type { Engine } from "./db.js";
import { quoteIdent, quoteLiteral, sqlNumber } from "./sql.js";

export interface SampleCounts { nonMissing: number; numberLike: number; integerLike: number; distinct: number }

export async function sampleCountsUnnested(
  engine: Engine, view: string, columns: readonly string[], sampleRows: number, numberPattern: string, integerPattern: string,
): Promise<SampleCounts[]> {
  const out: SampleCounts[] = columns.map(() => ({ nonMissing: 0, numberLike: 0, integerLike: 0, distinct: 0 }));
  if (columns.length === 0) return out;
  const cols = columns.map((_, i) => sqlNumber(i)).join(", ");
  const values = columns.map(quoteIdent).join(", ");
  const rows = await engine.rows<{ col: number; n: number; k: number; j: number; d: number }>(
    `SELECT col, coalesce(sum(c) FILTER (WHERE v IS NOT NULL), 0)::DOUBLE AS n,
            coalesce(sum(c) FILTER (WHERE regexp_full_match(v, ${quoteLiteral(numberPattern)})), 0)::DOUBLE AS k,
            coalesce(sum(c) FILTER (WHERE regexp_full_match(v, ${quoteLiteral(integerPattern)})), 0)::DOUBLE AS j, count(v)::DOUBLE AS d
     FROM (SELECT col, v, count(*) AS c
           FROM (SELECT unnest([${cols}])::INTEGER AS col, unnest([${values}]::VARCHAR[]) AS v
                 FROM (SELECT * FROM ${view} LIMIT ${sqlNumber(sampleRows)}))
           GROUP BY col, v)
     GROUP BY col`, "sampling the first rows");
  for (const r of rows) {
    const o = out[r.col];
    if (o) { o.nonMissing = r.n; o.numberLike = r.k; o.integerLike = r.j; o.distinct = r.d; }
  }
  return out;
}
