/**
 * engine/wideSample: the first-rows sample of engine/inspect for wide inputs in ONE query. The
 * sampled rows are unnested into (col, value) — as in the wide pass — and counted per column, so a
 * wide CSV is read (and sniffed) once instead of once per batch of 200 columns. The counts are the
 * ones inspect's batched query takes over the same LIMIT subquery: non-missing values, values that
 * match the number pattern and distinct values.
 */
import type { Engine } from "./db.js";
import { quoteIdent, quoteLiteral, sqlNumber } from "./sql.js";

export interface SampleCounts { nonMissing: number; numberLike: number; distinct: number }

export async function sampleCountsUnnested(
  engine: Engine, view: string, columns: readonly string[], sampleRows: number, numberPattern: string,
): Promise<SampleCounts[]> {
  const out: SampleCounts[] = columns.map(() => ({ nonMissing: 0, numberLike: 0, distinct: 0 }));
  if (columns.length === 0) return out;
  const cols = columns.map((_, i) => sqlNumber(i)).join(", ");
  const values = columns.map(quoteIdent).join(", ");
  const rows = await engine.rows<{ col: number; n: number; k: number; d: number }>(
    `SELECT col, count(v)::DOUBLE AS n, count(*) FILTER (WHERE regexp_full_match(v, ${quoteLiteral(numberPattern)}))::DOUBLE AS k,
            count(DISTINCT v)::DOUBLE AS d
     FROM (SELECT unnest([${cols}])::INTEGER AS col, unnest([${values}]::VARCHAR[]) AS v
           FROM (SELECT * FROM ${view} LIMIT ${sqlNumber(sampleRows)}))
     GROUP BY col`, "sampling the first rows");
  for (const r of rows) {
    const o = out[r.col];
    if (o) { o.nonMissing = r.n; o.numberLike = r.k; o.distinct = r.d; }
  }
  return out;
}
