/**
 * pipeline/advise: THE decision pipeline — everything after the pass, read from the level table
 * `tailsift_levels` alone. `scan` calls it after its pass; `scan --levels` after loading tables
 * made elsewhere. One order, written here once:
 *
 *   1. bounded summaries → column figures (counts, coverage, unseen rate, role, variants,
 *      placeholder levels); the numeric and time columns get their role and decision from the
 *      pass's exact counts (advice/passThroughColumns) when the profile is assembled
 *   2. target figures (prior weight, flags, leakage, level rates) — or, without a target, the
 *      hashing widths (advice/hashWidth)
 *   3. hierarchy figures (hierarchy/hierarchyFor)
 *   4. rules (advice/recommend, in the order of RULES) → the rules' answer
 *   5. with a target: out-of-fold evidence (evidence/evidenceFor) may replace the rules' answer
 *      (evidence/applyEvidence); without one: a useful hierarchy turns an identifier's drop into
 *      backoff then codes, or hashing past the width cap (hierarchy/applyHierarchy)
 *   6. the user's --decide overrides (advice/overrides), keeping what was advised
 *   7. notes that hold for the final decision (evidence not computed, one fold)
 *
 * Each column's recommendation is the result of these steps; the reasons describe that result
 * (a stage that does not decide says why in its own words, never in the words of the choice it
 * did not make). The caller records how folds were made (settings.fold). The top-level list is
 * cut to `top` only at the end: --top shapes the display, never the advice.
 */
import { addHashing } from "../advice/hashWidth.js";
import { overrideRecommendation } from "../advice/overrides.js";
import type { AdvicePolicy } from "../advice/policy.js";
import { recommend } from "../advice/recommend.js";
import type { PassTotals } from "../engine/aggregate.js";
import type { ColumnSample } from "../engine/inspect.js";
import type { Engine } from "../engine/db.js";
import { writeLevelTable } from "../engine/levelFile.js";
import { applyEvidence } from "../evidence/applyEvidence.js";
import { evidenceFor } from "../evidence/evidenceFor.js";
import { applyHierarchy } from "../hierarchy/applyHierarchy.js";
import { TailsiftError } from "../errors.js";
import { hierarchyFor } from "../hierarchy/hierarchyFor.js";
import type { ColumnProfile, Encoding, Profile, ProfileTarget, Recommendation } from "../profile/types.js";
import { toolVersion } from "../version.js";
import { measureColumns, otherColumns } from "./columns.js";
import { addPlaceholderFigures } from "./placeholderLevels.js";
import { addTargetFigures } from "./targetFigures.js";
import type { FlatOofScores } from "../engine/leakage.js";

export interface AdviceInput {
  levelColumns: string[];
  /** Columns passed through (numeric and time columns), not counted as levels. */
  numeric: string[];
  /** Of `numeric`: the columns with the time role (engine/timeColumns). */
  time?: string[];
  /** The first-rows sample (scan only; absent when advising from level tables). */
  samples?: ColumnSample[];
  /** --missing-like values (normalised) the input was read with; recorded as settings.missingLike. */
  missingLike?: string[];
  allColumns: string[];
  totals: PassTotals;
  target: ProfileTarget | undefined;
  /** The target's column name (also when the target is not measured). */
  targetColumn?: string;
  policy: AdvicePolicy;
  top: number;
  decide?: Record<string, Encoding>;
  /** False when the level table has one fold: out-of-fold figures are not measured (scan --levels). */
  outOfFold: boolean;
  /** Write the level table (Parquet) here before the engine closes. */
  levelTableOut?: string;
  input: Profile["input"];
}

const EVIDENCE_SKIPPED = "Out-of-fold evidence for this column was not computed: it ran out of memory under --memory-limit; the rules' advice stands.";
export const ONE_FOLD_REASON = "Out-of-fold figures need at least two folds; these level tables have one (fold 0 on every row), so the out-of-fold score is not measured. Write the tables with tailsift sql --fold-expr to get it.";

const withReason = (rec: Recommendation, reason: string): Recommendation => ({ ...rec, reasons: [...rec.reasons, reason] });

export async function adviseFromLevelTable(engine: Engine, ctx: AdviceInput): Promise<Profile> {
  const { target, policy } = ctx;
  // 1. summaries → figures
  const { columns, tops } = await measureColumns(engine, ctx.levelColumns, ctx.totals.rows, policy, ctx.top);
  await addPlaceholderFigures(engine, columns);
  // 2. target figures, or hashing widths
  let sharedFlat: FlatOofScores | undefined;
  if (target) {
    sharedFlat = await addTargetFigures(engine, columns, tops, target);
    if (!ctx.outOfFold) for (const c of columns) if (c.target) c.target.leakage.outOfFold = null;
  } else {
    await addHashing(engine, columns, policy);
  }
  // 3. hierarchy
  const hierarchy = await hierarchyFor(engine, columns, policy);
  for (const [col, h] of hierarchy) columns[col]!.hierarchy = h;
  // 4. rules (evidenceFor reads the rules' answer to decide where evidence applies)
  for (const column of columns) column.recommendation = recommend(column, policy, target);
  // 5. evidence or hierarchy
  const advised = columns.map((c) => c.recommendation);
  if (target) {
    const skipped = new Set<number>();
    const evidence = await evidenceFor(engine, columns, target, policy, hierarchy, skipped, sharedFlat);
    for (const col of skipped) advised[col] = withReason(advised[col]!, EVIDENCE_SKIPPED);
    for (const [col, e] of evidence) {
      const column = columns[col]!;
      column.evidence = e;
      if (ctx.outOfFold) advised[col] = applyEvidence(column, e, policy);
    }
  } else {
    for (const [col, h] of hierarchy) advised[col] = applyHierarchy(columns[col]!, h, policy);
  }
  // 6. overrides, 7. notes: the final decision, set once
  const decide = checkedDecisions(columns, ctx.decide);
  columns.forEach((column, col) => {
    const encoding = decide.get(column.name);
    let rec = advised[col]!;
    if (encoding !== undefined) rec = overrideRecommendation(column, encoding, rec, policy);
    if (!ctx.outOfFold && column.target) rec = withReason(rec, ONE_FOLD_REASON);
    column.recommendation = rec;
    column.topLevels = column.topLevels.slice(0, ctx.top);
  });
  if (ctx.levelTableOut) await writeLevelTable(engine, ctx.levelColumns, ctx.levelTableOut);
  return assemble(ctx, columns);
}

function checkedDecisions(columns: readonly ColumnProfile[], decide: Record<string, Encoding> | undefined): Map<string, Encoding> {
  const out = new Map(Object.entries(decide ?? {}));
  for (const name of out.keys()) {
    if (!columns.some((c) => c.name === name)) throw new TailsiftError("unknown_column", `--decide: column '${name}' is not a profiled categorical column`);
  }
  return out;
}

function assemble(ctx: AdviceInput, columns: ColumnProfile[]): Profile {
  const { policy, target } = ctx;
  const others = otherColumns(ctx);
  const order = new Map(ctx.allColumns.map((c, i) => [c, i]));
  const all = [...columns, ...others].sort((a, b) => (order.get(a.name) ?? 0) - (order.get(b.name) ?? 0));
  return {
    tool: { name: "tailsift", version: toolVersion(), engine: "duckdb" },
    createdAt: new Date().toISOString(),
    input: ctx.input,
    ...(target ? { target } : {}),
    settings: {
      folds: policy.folds, seed: policy.seed, top: ctx.top, maxOneHot: policy.maxOneHot,
      minLevelRows: policy.minLevelRows, coverage: policy.coverage, collisionBudget: policy.collisionBudget,
      maxHashBits: policy.hashMaxBits,
      ...(ctx.missingLike && ctx.missingLike.length > 0 ? { missingLike: ctx.missingLike } : {}),
    },
    columns: all,
  };
}
