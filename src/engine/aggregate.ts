/**
 * engine/aggregate: the ONE pass over the raw rows. It builds the level table inside DuckDB,
 *   tailsift_levels(col, level, fold, rows, n_y, sum_y, sum_y2)
 * where col is the index of the column in the pass, level its text value (NULL = missing), fold
 * the row's fold, rows the row count, n_y the rows with a usable target and sum_y / sum_y2 the
 * target sums (a multi-class target adds sum_c0 … sum_c{K-1}, the rows of each class, and its sum_y /
 * sum_y2 are those of the class index, never read). Rows with col = -1 are the per-fold totals (all rows), which also carry the count
 * of target values that did not fit the target kind and the non-missing count of numeric columns.
 */
import { formatContentFingerprint } from "./contentFingerprint.js";
import type { Engine } from "./db.js";
import { quoteIdent, sqlNumber } from "./sql.js";
import { readTimeTotals, timeFlagSql, timePassAggregates, timeTotalsSql, timeValueSql, type TimeTotals } from "./timeColumns.js";
import { buildWideLevelTable, useWidePass } from "./widePass.js";
import { buildPassExtras, dropPassExtras, extrasApart, totalsRowsSql, wideExtrasApart, withoutExtras, withoutTimeAndContent } from "./passExtras.js";
import { keyedRowItems, keyedSets, readKeyedTotals, splitKeyed, type KeyedSplit } from "./keyedExtras.js";

export { LEVEL_TABLE, type PassPlan } from "./passPlan.js";
import { classSumColumn, classSumsSql, DISTINCT_COL_BASE, LEVEL_TABLE, planClasses, rowFieldsSql, type PassPlan } from "./passPlan.js";

export interface PassTotals {
  rows: number;
  foldRows: number[];
  targetRows: number;
  sumY: number;
  sumY2: number;
  badTargets: number;
  nonMissing: Map<string, number>;
  /** The content fingerprint, when the plan asked for it. */
  content?: string;
  /** Per time column: exact range and granularity counts. */
  time?: Map<string, TimeTotals>;
  /** Per distinct-counted column: exact distinct values and rows of the most repeated value. */
  distinct?: Map<string, { distinct: number; maxRows: number }>;
  /** Multi-class targets: the rows of each class (in the plan's class order). */
  classRows?: number[];
}

/**
 * The level-table query. For a binary target y ∈ {0, 1}, so Σy² = Σy and is not summed twice.
 * `keyed`: extras carried as grouping keys (engine/keyedExtras); their entries are read and
 * deleted by readPassTotals.
 */
export function levelPassSql(plan: PassPlan, keyed?: KeyedSplit): string {
  const byKey = keyed ? keyedSets(keyed) : { sets: [], grouped: [] };
  const inner = [
    ...rowFieldsSql(plan),
    ...plan.levelColumns.map((c, i) => `${quoteIdent(c)} AS __v${i}`),
    ...plan.countColumns.map((c, i) => `${quoteIdent(c)} AS __n${i}`),
    ...(plan.timeColumns ?? []).map((c, i) => `${timeValueSql(quoteIdent(c))} AS __t${i}`),
    ...(plan.distinctColumns ?? []).map((c, i) => `${quoteIdent(c)} AS __k${i}`),
    ...(keyed ? keyedRowItems(keyed) : []),
  ];
  // distinct-counted columns are grouped without the fold, as col = DISTINCT_COL_BASE - j (read and removed after the pass)
  const keys = plan.distinctColumns ?? [];
  const grouped = [...plan.levelColumns.map((_, i) => ({ v: `__v${i}`, level: `__v${i}`, col: i })),
    ...keys.map((_, j) => ({ v: `__k${j}`, level: `__k${j}`, col: DISTINCT_COL_BASE - j })), ...byKey.grouped];
  const sets = [...plan.levelColumns.map((_, i) => `(__v${i}, __fold)`), "(__fold)", ...keys.map((_, j) => `(__k${j})`), ...byKey.sets];
  const which = grouped.length === 0
    ? "-1"
    : `CASE ${grouped.map((g) => `WHEN GROUPING(${g.v}) = 0 THEN ${g.col}`).join(" ")} ELSE -1 END`;
  const level = grouped.length === 0
    ? "NULL::VARCHAR"
    : grouped.length === 1 ? grouped[0]!.level : `COALESCE(${grouped.map((g) => g.level).join(", ")})`;
  const counts = classSumsSql(plan) + plan.countColumns.map((_, i) => `, count(__n${i})::BIGINT AS __nn${i}`).join("")
    + (plan.timeColumns ?? []).map((_, i) => `, ${timePassAggregates(`__t${i}`, i)}`).join("")
    + (plan.contentColumns ? ", sum(__h)::HUGEINT AS __content" : "");
  // time columns' granularity flags are computed per row, below the grouping (engine/timeColumns)
  const flags = (plan.timeColumns ?? []).flatMap((_, i) => timeFlagSql(`__t${i}`, i));
  const rows = flags.length === 0 ? `(SELECT ${inner.join(", ")} FROM ${plan.view})`
    : `(SELECT *, ${flags.join(", ")} FROM (SELECT ${inner.join(", ")} FROM ${plan.view}))`;
  return `SELECT (${which})::INTEGER AS col, ${level} AS level, __fold AS fold, count(*)::BIGINT AS rows,
  count(__y)::BIGINT AS n_y, coalesce(sum(__y), 0)::DOUBLE AS sum_y, ${plan.target?.kind === "binary" ? "coalesce(sum(__y), 0)::DOUBLE" : "coalesce(sum(__y * __y), 0)::DOUBLE"} AS sum_y2,
  count(*) FILTER (WHERE __bad)::BIGINT AS bad${counts}
FROM ${rows}
GROUP BY GROUPING SETS (${sets.join(", ")})`;
}

/**
 * Columns counted per query. GROUPING SETS memory grows faster than the number of sets (measured:
 * 250 columns 0.9 GB, 1,000 columns 4.9 GB on 50 rows), so wider inputs are counted in batches of
 * this many columns — one pass per batch; every input of up to PASS_BATCH columns is one pass.
 */
export const PASS_BATCH = 200;

/** Runs the pass and returns the totals; the level table stays in DuckDB. */
export async function buildLevelTable(engine: Engine, plan: PassPlan, doing = "scanning the input"): Promise<PassTotals> {
  // wide inputs: one unnest pass (engine/widePass) builds the same table; totals are read below
  if (useWidePass(plan)) {
    // time columns' aggregates, FILTERed to the totals entries, made the wide pass crawl (60 date
    // columns × 10k rows: 166 s); with time columns the time and content totals are summed apart
    const apart = wideExtrasApart(plan);
    const nonMissing = await buildWideLevelTable(engine, apart ? withoutTimeAndContent(plan) : plan, doing);
    if (apart) await buildPassExtras(engine, { ...plan, countColumns: [] }, doing);
    try {
      const totals = await readPassTotals(engine, plan, apart, nonMissing);
      await dropExtrasColumns(engine);
      return totals;
    } finally {
      if (apart) await dropPassExtras(engine);
    }
  }
  // non-missing counts and few-valued time columns as grouping keys (engine/keyedExtras); the other
  // numeric, time and content totals inside the GROUPING SETS pass, or apart (engine/passExtras)
  const keyed = splitKeyed(plan);
  const rest = keyed.rest;
  const apart = extrasApart(rest);
  await buildGroupingSetsLevelTable(engine, apart ? withoutExtras(rest) : rest, keyed, doing);
  if (apart) await buildPassExtras(engine, rest, doing);
  try {
    const totals = await readPassTotals(engine, rest, apart);
    const byKey = await readKeyedTotals(engine, keyed);
    // in the plan's column order, as the aggregates give them
    const nonMissing = new Map<string, number>();
    for (const c of plan.countColumns) nonMissing.set(c, byKey.nonMissing.get(c) ?? totals.nonMissing.get(c) ?? 0);
    const time = new Map<string, TimeTotals>();
    for (const c of plan.timeColumns ?? []) { const t = byKey.time.get(c) ?? totals.time?.get(c); if (t) time.set(c, t); }
    await dropExtrasColumns(engine);
    return { ...totals, nonMissing, time };
  } finally {
    if (apart) await dropPassExtras(engine);
  }
}

/**
 * Drops the extras' columns (__content, __nn0 …, __tmin0 …) once the totals are read: inline, every
 * entry of the level table carries them though only the fold totals' are read, and nothing after
 * the pass reads them. Dropping a column frees its storage at once (measured: 17M rows, a HUGEINT
 * column, 330 MB freed in 3 ms).
 */
async function dropExtrasColumns(engine: Engine): Promise<void> {
  const extras = await engine.rows<{ name: string }>(
    `SELECT column_name AS name FROM duckdb_columns() WHERE database_name = 'temp' AND table_name = '${LEVEL_TABLE}' AND starts_with(column_name, '__')`, "reading the pass totals");
  for (const { name } of extras) await engine.run(`ALTER TABLE ${LEVEL_TABLE} DROP COLUMN ${quoteIdent(name)}`, "reading the pass totals");
}

async function buildGroupingSetsLevelTable(engine: Engine, plan: PassPlan, keyed: KeyedSplit, doing: string): Promise<void> {
  const first = plan.levelColumns.slice(0, PASS_BATCH);
  await engine.run(`CREATE OR REPLACE TEMP TABLE ${LEVEL_TABLE} AS ${levelPassSql({ ...plan, levelColumns: first }, keyed)}`, doing);
  for (let offset = PASS_BATCH; offset < plan.levelColumns.length; offset += PASS_BATCH) {
    const batch = plan.levelColumns.slice(offset, offset + PASS_BATCH);
    const sql = levelPassSql({ ...plan, levelColumns: batch, countColumns: [], timeColumns: [], distinctColumns: [] });
    const classes = planClasses(plan).map((_, k) => `, ${classSumColumn(k)}`).join("");
    await engine.run(
      `INSERT INTO ${LEVEL_TABLE} BY NAME SELECT col + ${sqlNumber(offset)} AS col, level, fold, rows, n_y, sum_y, sum_y2, bad${classes} FROM (${sql}) WHERE col >= 0`,
      `${doing} (columns ${offset + 1}–${offset + batch.length})`);
  }
}

/** Exact distinct values per distinct-counted column (summed over folds), then their rows are removed. */
async function readDistinctCounts(engine: Engine, plan: PassPlan): Promise<Map<string, { distinct: number; maxRows: number }>> {
  const keys = plan.distinctColumns ?? [];
  const distinct = new Map<string, { distinct: number; maxRows: number }>();
  if (keys.length === 0) return distinct;
  const found = await engine.rows<{ col: number; d: number; mx: number }>(
    `SELECT col, count(*)::DOUBLE AS d, max(r)::DOUBLE AS mx
     FROM (SELECT col, level, sum(rows) AS r FROM ${LEVEL_TABLE} WHERE col <= ${sqlNumber(DISTINCT_COL_BASE)} AND level IS NOT NULL GROUP BY col, level)
     GROUP BY col`, "counting distinct numeric values");
  keys.forEach((c) => distinct.set(c, { distinct: 0, maxRows: 0 }));
  for (const r of found) { const c = keys[DISTINCT_COL_BASE - r.col]; if (c !== undefined) distinct.set(c, { distinct: r.d, maxRows: r.mx }); }
  await engine.run(`DELETE FROM ${LEVEL_TABLE} WHERE col <= ${sqlNumber(DISTINCT_COL_BASE)}`, "counting distinct numeric values");
  return distinct;
}

/** `nonMissing`: the numeric columns' counts when the pass already summed them (the wide pass). */
async function readPassTotals(engine: Engine, plan: PassPlan, apart: boolean, nonMissing?: Map<string, number>): Promise<PassTotals> {
  const distinct = await readDistinctCounts(engine, plan);
  const classes = planClasses(plan);
  const counts = classes.map((_, k) => `, sum(${classSumColumn(k)})::DOUBLE AS c${k}`).join("")
    + (nonMissing ? [] : plan.countColumns).map((_, i) => `, sum(__nn${i})::DOUBLE AS nn${i}`).join("")
    + (plan.contentColumns ? ", sum(__content)::VARCHAR AS content" : "");
  const rows = await engine.rows<Record<string, number>>(
    `SELECT fold, rows::DOUBLE AS rows, n_y::DOUBLE AS n_y, sum_y, sum_y2, bad::DOUBLE AS bad${counts}
     FROM ${totalsRowsSql(apart)} GROUP BY ALL ORDER BY fold`, "reading the pass totals");
  const foldRows = Array.from({ length: plan.fold.k }, () => 0);
  const totals: PassTotals = { rows: 0, foldRows, targetRows: 0, sumY: 0, sumY2: 0, badTargets: 0, nonMissing: new Map(), time: new Map(), distinct,
    ...(classes.length > 0 ? { classRows: classes.map(() => 0) } : {}) };
  for (const r of rows) {
    foldRows[r.fold ?? 0] = r.rows ?? 0;
    totals.rows += r.rows ?? 0;
    totals.targetRows += r.n_y ?? 0;
    totals.sumY += r.sum_y ?? 0;
    totals.sumY2 += r.sum_y2 ?? 0;
    totals.badTargets += r.bad ?? 0;
    totals.classRows?.forEach((n, k) => { totals.classRows![k] = n + (r[`c${k}`] ?? 0); });
    if (!nonMissing) plan.countColumns.forEach((c, i) => totals.nonMissing.set(c, (totals.nonMissing.get(c) ?? 0) + (r[`nn${i}`] ?? 0)));
  }
  if (nonMissing) totals.nonMissing = nonMissing;
  if (plan.contentColumns) totals.content = formatContentFingerprint(totals.rows, rows.map((r) => (r as unknown as { content: string | null }).content));
  const times = plan.timeColumns ?? [];
  if (times.length > 0) {
    // the time aggregates are combined over folds in SQL (min/max of timestamps, not of text in JS)
    const [all] = await engine.rows<Record<string, unknown>>(
      `SELECT ${times.map((_, i) => timeTotalsSql(i)).join(", ")} FROM ${totalsRowsSql(apart)}`, "reading the time ranges");
    times.forEach((c, i) => totals.time?.set(c, readTimeTotals(all ?? {}, i)));
  }
  return totals;
}
