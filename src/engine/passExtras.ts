/**
 * engine/passExtras: the per-fold extras of the pass — the non-missing counts of numeric columns,
 * the time columns' range and granularity aggregates and the content hash — summed in a second
 * statement grouped by fold only, instead of inside the GROUPING SETS pass.
 *
 * Why: GROUPING SETS evaluates every aggregate in every grouping set, so each extra costs one
 * update per row per measured column, and widens every hash-table entry of the level sets, though
 * only the fold-totals set is ever read. Measured on the bench's 1M-row sample (11 level columns, 3
 * numeric, 1 time; bench/README.md): the pass took 1.1–1.8 s with the extras inline and 0.5–1.0 s
 * without them, and the extras alone, grouped by fold, 0.2–0.3 s — on Parquet, where a second read
 * of the columns is cheap. On CSV the second read re-parses the file, so text inputs keep the one
 * read unless the extras are many (INLINE_EXTRAS_MAX).
 *
 * The wide pass (engine/widePass) sums them apart whenever there are time columns: there they were
 * aggregates FILTERed to each row's totals entry, and 60 date columns made a 10k-row pass take 166 s
 * (test/scan/passExtras).
 *
 * The figures are the same either way: counts, min/max and a HUGEINT sum of hashes are exact
 * whatever the order or grouping (test/scan/passExtras).
 */
import type { Engine } from "./db.js";
import { LEVEL_TABLE, rowFieldsSql, type PassPlan } from "./passPlan.js";
import { quoteIdent } from "./sql.js";
import { splitKeyed } from "./keyedExtras.js";
import { timeFlagSql, timePassAggregates, timeValueSql } from "./timeColumns.js";

/** The per-fold extras when summed apart (one row per fold). */
export const PASS_EXTRAS_TABLE = "tailsift_pass_extras";

const hasExtras = (plan: PassPlan): boolean =>
  plan.countColumns.length > 0 || (plan.timeColumns ?? []).length > 0 || (plan.contentColumns ?? []).length > 0;

/**
 * Most extras aggregates per grouping set that a text input (CSV, JSON lines) still carries inline:
 * at most this many it is read once. Each extra costs one update per row per measured column
 * inside the pass, a second read costs one re-parse: measured on CSV, 11 extras (3 numeric
 * columns, one time column, the content hash; the bench's sample at 10M rows) took the same time
 * either way and 2.2 GB less memory apart; 421 (60 date columns, 10k rows) took 13.4 s inline and
 * 1.4 s apart; 2 (the stress table) stay inline.
 */
export const INLINE_EXTRAS_MAX = 8;

/** Aggregates the extras add to every grouping set: a count per numeric column, seven per time column, one for the content hash. */
export function extrasAggregates(plan: Pick<PassPlan, "countColumns" | "timeColumns" | "contentColumns">): number {
  return plan.countColumns.length + 7 * (plan.timeColumns ?? []).length + (plan.contentColumns ? 1 : 0);
}

/**
 * Where a scan of `format` sums the plan's extras that are not grouping keys (engine/keyedExtras):
 * apart for Parquet (a column store re-reads cheaply), and for text inputs with many extras.
 */
export function extrasFor(format: string, plan: Pick<PassPlan, "countColumns" | "timeColumns" | "contentColumns" | "keyableTimeColumns">): "inline" | "apart" {
  return format === "parquet" || extrasAggregates(splitKeyed(plan).rest) > INLINE_EXTRAS_MAX ? "apart" : "inline";
}

/** True when the plan's extras are summed apart (TAILSIFT_PASS_EXTRAS=apart|inline forces it, for measuring and tests). */
export function extrasApart(plan: PassPlan): boolean {
  if (!hasExtras(plan)) return false;
  const forced = process.env.TAILSIFT_PASS_EXTRAS;
  if (forced === "apart" || forced === "inline") return forced === "apart";
  return plan.extras === "apart";
}

/** The plan without its extras: what the GROUPING SETS pass counts when they are summed apart. */
export function withoutExtras(plan: PassPlan): PassPlan {
  return { ...withoutTimeAndContent(plan), countColumns: [] };
}

/** True when the wide pass sums the time and content totals apart: whenever the plan has time columns. */
export const wideExtrasApart = (plan: PassPlan): boolean => (plan.timeColumns ?? []).length > 0;

/** The plan without its time columns and content hash (the wide pass keeps counting the numeric markers itself). */
export function withoutTimeAndContent(plan: PassPlan): PassPlan {
  const { contentColumns: _content, ...rest } = plan;
  return { ...rest, timeColumns: [] };
}

/** The extras per fold, with the column names the inline pass gives them (__nn0 …, __tmin0 …, __content). */
export function passExtrasSql(plan: PassPlan): string {
  const times = plan.timeColumns ?? [];
  const inner = [
    ...rowFieldsSql(plan),
    ...plan.countColumns.map((c, i) => `${quoteIdent(c)} AS __n${i}`),
    ...times.map((c, i) => `${timeValueSql(quoteIdent(c))} AS __t${i}`),
  ];
  const aggregates = [
    ...plan.countColumns.map((_, i) => `count(__n${i})::BIGINT AS __nn${i}`),
    ...times.map((_, i) => timePassAggregates(`__t${i}`, i)),
    ...(plan.contentColumns ? ["sum(__h)::HUGEINT AS __content"] : []),
  ];
  const flags = times.flatMap((_, i) => timeFlagSql(`__t${i}`, i));
  const rows = `(SELECT ${inner.join(", ")} FROM ${plan.view})`;
  const flagged = flags.length === 0 ? rows : `(SELECT *, ${flags.join(", ")} FROM ${rows})`;
  return `SELECT __fold AS fold, ${aggregates.join(", ")} FROM ${flagged} GROUP BY __fold`;
}

/** Sums the extras apart into PASS_EXTRAS_TABLE. */
export async function buildPassExtras(engine: Engine, plan: PassPlan, doing: string): Promise<void> {
  await engine.run(`CREATE OR REPLACE TEMP TABLE ${PASS_EXTRAS_TABLE} AS ${passExtrasSql(plan)}`, `${doing} (numeric, time and content totals)`);
}

/**
 * The rows the pass totals are read from: the level table's fold totals (col = -1), with the
 * extras beside them when they were summed apart.
 */
export function totalsRowsSql(apart: boolean): string {
  if (!apart) return `(SELECT * FROM ${LEVEL_TABLE} WHERE col = -1)`;
  return `(SELECT l.*, e.* EXCLUDE (fold) FROM ${LEVEL_TABLE} l LEFT JOIN ${PASS_EXTRAS_TABLE} e ON l.fold = e.fold WHERE l.col = -1)`;
}

/** Drops the extras table once read. */
export async function dropPassExtras(engine: Engine): Promise<void> {
  await engine.run(`DROP TABLE IF EXISTS ${PASS_EXTRAS_TABLE}`, "reading the pass totals");
}
