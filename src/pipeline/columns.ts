/**
 * pipeline/columns: step 1 of the advice pipeline — the target-free figures of every level
 * column from bounded summaries of the level table (count-of-counts, top levels, spelling
 * variants), its role (constant, identifier-like, categorical), and the record of the columns
 * that are not measured as levels (target, numeric, time, excluded).
 */
import type { AdvicePolicy } from "../advice/policy.js";
import type { Engine } from "../engine/db.js";
import { buildLevelTotals, findVariants, summariseLevels, type LevelRow } from "../engine/levels.js";
import { columnFigures, isIdentifierLike, unmeasuredColumn } from "../profile/columnFigures.js";
import type { ColumnProfile, ProfileTarget } from "../profile/types.js";
import type { PassTotals } from "../engine/aggregate.js";
import type { ColumnSample } from "../engine/inspect.js";
import { passThroughProfile } from "../advice/passThroughColumns.js";

/** Spelling variants are looked for in columns of up to this many levels (see measureColumns). */
export const VARIANT_MAX_LEVELS = 100_000;

/** Top levels read per column: enough for the widest one-hot the rules can advise (and the display). */
const TOP_READ = (policy: AdvicePolicy) => policy.maxOneHot + 1;

/**
 * Figures per level column (index = `col` of the level table) and the top rows behind them.
 * The top list holds at least maxOneHot + 1 levels whatever --top says: the rules read it.
 */
export async function measureColumns(engine: Engine, levelColumns: readonly string[], rows: number, policy: AdvicePolicy, top = 0): Promise<{ columns: ColumnProfile[]; tops: LevelRow[][] }> {
  await buildLevelTotals(engine);
  const summaries = await summariseLevels(engine, levelColumns.length, Math.max(top, TOP_READ(policy)));
  const columns: ColumnProfile[] = levelColumns.map((name, col) => {
    const s = summaries[col];
    const figures = columnFigures({
      name, rows, missing: s?.missing ?? 0, countOfCounts: s?.countOfCounts ?? [],
      top: (s?.top ?? []).map((t) => ({ level: t.level, rows: t.rows })),
    });
    const nonMissing = figures.rows - figures.missing;
    if (figures.distinct <= 1) figures.role = "constant";
    else if (isIdentifierLike(figures.distinct, nonMissing, figures.unseenRate)) figures.role = "identifier";
    return { ...figures, recommendation: { encoding: "drop", params: {}, reasons: [] } };
  });
  // spelling variants are looked for in columns of up to VARIANT_MAX_LEVELS levels: past that the
  // column is identifier-like and its level count would dominate the cost of the whole scan
  const variants = await findVariants(engine, columns.flatMap((c, col) => (c.distinct > 1 && c.distinct <= VARIANT_MAX_LEVELS ? [col] : [])));
  for (const [col, v] of variants) {
    const column = columns[col];
    if (column && v.groups > 0) column.variants = { groups: v.groups, levels: v.levels, rowShare: rows > 0 ? v.rows / rows : 0, examples: v.examples };
  }
  return { columns, tops: summaries.map((s) => s.top) };
}

/**
 * The record of every column that is not a level column: the target, numeric (or numeric
 * identifier), time and excluded columns (advice/passThroughColumns decides the numeric and time ones).
 */
export function otherColumns(ctx: {
  allColumns: readonly string[]; levelColumns: readonly string[]; numeric: readonly string[]; time?: readonly string[];
  samples?: readonly ColumnSample[]; targetColumn?: string; target: ProfileTarget | undefined; totals: PassTotals;
}): ColumnProfile[] {
  const { totals } = ctx;
  return ctx.allColumns
    .filter((c) => !ctx.levelColumns.includes(c))
    .map((c) => c === ctx.targetColumn
      ? unmeasuredColumn(c, "target", totals.rows, ctx.target?.missing ?? 0, "The target: passed through unchanged.")
      : ctx.numeric.includes(c)
        ? passThroughProfile(c, totals, ctx.samples, ctx.time)
        : unmeasuredColumn(c, "excluded", totals.rows, 0, "Excluded by --columns/--exclude: not measured."));
}
