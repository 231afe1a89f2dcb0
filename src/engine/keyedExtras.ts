/**
 * engine/keyedExtras: two of the pass's per-fold extras carried as grouping KEYS of the GROUPING
 * SETS pass instead of as aggregates.
 *
 *  - Non-missing counts of numeric and time columns: one more grouping set (__fold, __nm), where
 *    __nm is the row's bitmask of which of the first MASK_MAX count columns are not missing. A
 *    column's count is the sum of `rows` over the masks with its bit set. Its entries get col =
 *    MASK_COL and the mask, as text, as their level.
 *  - The range and granularity of a time column with few distinct values: a grouping set (__tk_i,
 *    __fold) of the column's raw text, col = KEYED_TIME_BASE - i. Its min, max, parsed count and
 *    granularity counts are then read from the distinct texts with the same expressions the
 *    aggregates use (engine/timeColumns), each weighted by its rows: the same figures, exactly.
 *
 * Why: GROUPING SETS evaluates every aggregate in every grouping set, so each extra aggregate
 * costs one update per row per measured column and widens every entry of the level table; and a
 * time column's parse (a regex and a cast) ran on every row. A key costs one hash-table insert per
 * row into a table of a few entries (masks × folds, or distinct times × folds), and the parse runs
 * once per distinct value. Measured on the bench's 1M-row sample CSV (10 level columns, 3 count
 * columns, 1 date column; bench/README.md): the pass with every extra inline 1.6–1.8 s, with them
 * summed apart 0.9 + 0.7 s (a second parse of the file), keyed (content hash still inline)
 * 1.16–1.22 s, with no extras at all 0.96–1.1 s.
 *
 * Time columns are keyed only when the first rows show few distinct values (KEYED_TIME_SHARE): a
 * timestamp column unique per row would make its set as large as an identifier's. The keyed rows
 * are read and deleted right after the pass; nothing after it sees them.
 */
import type { Engine } from "./db.js";
import type { ColumnSample } from "./inspect.js";
import { DISTINCT_COL_BASE, LEVEL_TABLE, type PassPlan } from "./passPlan.js";
import { quoteIdent, sqlNumber } from "./sql.js";
import { readTimeTotals, timeTotalsFromValuesSql, timeValueSql, type TimeTotals } from "./timeColumns.js";

/** col of the non-missing mask entries. */
export const MASK_COL = -2;
/** col of time column i's keyed entries: KEYED_TIME_BASE - i (above DISTINCT_COL_BASE). */
export const KEYED_TIME_BASE = -1000;
/** Count columns carried in the mask (the rest stay aggregates): 2^16 masks at most per fold. */
export const MASK_MAX = 16;
/** Time columns keyed at most (each is one grouping set). */
export const KEYED_TIME_MAX = 32;
/**
 * A time column is keyed when its distinct values in the first rows are at most this share of the
 * rows sampled (our choice, measured: dates of a few years in 50,000 rows are about 2 %, times to
 * the minute or second mostly above 50 %).
 */
export const KEYED_TIME_SHARE = 0.1;

/** The keyed part of a plan and the rest, whose extras stay aggregates (inline or apart). */
export interface KeyedSplit<P = PassPlan> {
  /** Count columns carried in the mask (bit i = counts[i]). */
  counts: readonly string[];
  /** Time columns keyed by their text (entries col = KEYED_TIME_BASE - i). */
  times: readonly string[];
  /** The plan without the keyed extras. */
  rest: P;
}

/** TAILSIFT_PASS_KEYED=off carries every extra as an aggregate, as before (for measuring and tests). */
export const keyingOff = (): boolean => process.env.TAILSIFT_PASS_KEYED === "off";

/** The time columns whose first rows show few distinct values (scan's choice for the plan). */
export function keyableTimeColumns(samples: readonly ColumnSample[], time: readonly string[]): string[] {
  return time.filter((c) => {
    const s = samples.find((x) => x.name === c);
    const sampled = s?.sampledRows ?? 0;
    return s !== undefined && sampled > 0 && s.distinct <= KEYED_TIME_SHARE * sampled;
  }).slice(0, KEYED_TIME_MAX);
}

/** Splits the plan's extras into the keyed ones and the rest (nothing keyed when keying is off). */
export function splitKeyed<P extends Pick<PassPlan, "countColumns" | "timeColumns" | "keyableTimeColumns">>(plan: P): KeyedSplit<P> {
  const keyable = new Set(plan.keyableTimeColumns ?? []);
  if (keyingOff() || (plan.countColumns.length === 0 && keyable.size === 0)) return { counts: [], times: [], rest: plan };
  const counts = plan.countColumns.slice(0, MASK_MAX);
  const allTimes = plan.timeColumns ?? [];
  const times = allTimes.filter((c) => keyable.has(c));
  return {
    counts, times,
    rest: { ...plan, countColumns: plan.countColumns.slice(MASK_MAX), timeColumns: allTimes.filter((c) => !keyable.has(c)), keyableTimeColumns: [] },
  };
}

/** The per-row SELECT items of the keyed extras: the mask and the keyed times' text. */
export function keyedRowItems(split: KeyedSplit): string[] {
  const mask = split.counts.length === 0 ? []
    : [`(${split.counts.map((c, i) => `(${quoteIdent(c)} IS NOT NULL)::BIGINT * ${sqlNumber(2 ** i)}`).join(" + ")}) AS __nm`];
  return [...mask, ...split.times.map((c, i) => `${quoteIdent(c)} AS __tk${i}`)];
}

/** The keyed grouping sets and how their entries are named (col, and the level as text). */
export function keyedSets(split: KeyedSplit): { sets: string[]; grouped: { v: string; level: string; col: number }[] } {
  const grouped = [
    ...(split.counts.length === 0 ? [] : [{ v: "__nm", level: "__nm::VARCHAR", col: MASK_COL }]),
    ...split.times.map((_, i) => ({ v: `__tk${i}`, level: `__tk${i}`, col: KEYED_TIME_BASE - i })),
  ];
  return { sets: grouped.map((g) => (g.v === "__nm" ? "(__fold, __nm)" : `(${g.v}, __fold)`)), grouped };
}

/** Reads the keyed extras' totals from the level table, then deletes their entries. */
export async function readKeyedTotals(engine: Engine, split: KeyedSplit): Promise<{ nonMissing: Map<string, number>; time: Map<string, TimeTotals> }> {
  const nonMissing = new Map<string, number>();
  const time = new Map<string, TimeTotals>();
  if (split.counts.length === 0 && split.times.length === 0) return { nonMissing, time };
  if (split.counts.length > 0) {
    const masks = await engine.rows<{ mask: string; rows: number }>(
      `SELECT level AS mask, sum(rows)::DOUBLE AS rows FROM ${LEVEL_TABLE} WHERE col = ${sqlNumber(MASK_COL)} GROUP BY level`, "reading the non-missing counts");
    split.counts.forEach((c) => nonMissing.set(c, 0));
    for (const m of masks) {
      const bits = BigInt(m.mask);
      split.counts.forEach((c, i) => { if ((bits >> BigInt(i)) & 1n) nonMissing.set(c, nonMissing.get(c)! + m.rows); });
    }
  }
  if (split.times.length > 0) {
    // the same expressions as the aggregates (engine/timeColumns), over distinct texts weighted by rows
    const found = await engine.rows<Record<string, unknown> & { col: number }>(
      `SELECT col, ${timeTotalsFromValuesSql("v", "rows", 0)}
       FROM (SELECT col, rows, ${timeValueSql("level")} AS v FROM ${LEVEL_TABLE}
             WHERE col <= ${sqlNumber(KEYED_TIME_BASE)} AND col > ${sqlNumber(KEYED_TIME_BASE - split.times.length)})
       GROUP BY col`, "reading the time ranges");
    split.times.forEach((c, i) => time.set(c, readTimeTotals(found.find((r) => r.col === KEYED_TIME_BASE - i) ?? {}, 0)));
  }
  await engine.run(`DELETE FROM ${LEVEL_TABLE} WHERE col < -1 AND col > ${sqlNumber(DISTINCT_COL_BASE)}`, "reading the pass totals");
  return { nonMissing, time };
}
