import path from "node:path";
/**
 * commands/drift: orchestration only. Reads a plan (profile.json + levels.parquet), makes one pass
 * over the new extract that builds its level table (the same GROUPING SETS query as scan, with
 * the plan's columns and target), compares the two tables inside DuckDB and turns the bounded
 * summaries into a DriftReport with a status per column.
 *
 * Compared: plan columns with levels (role categorical, identifier or constant — every column the
 * level table holds). Numeric, target and excluded columns have no levels and are not compared.
 */
import { buildLevelTable } from "../engine/aggregate.js";
import { withEngine, type Engine, type EngineOptions } from "../engine/db.js";
import { singleFold } from "../engine/folds.js";
import { describeFiles, openSource, type SourceOptions } from "../engine/source.js";
import { planMissingLike } from "../engine/missingLike.js";
import { classesSql, type TargetSpec } from "../engine/target.js";
import { classDrift } from "../drift/classDrift.js";
import { TailsiftError } from "../errors.js";
import type { ColumnProfile, Profile } from "../profile/types.js";
import { missingColumnDrift, presentColumnDrift, type TargetContext } from "../drift/columnDrift.js";
import { nameNewLevels, newColumnStats, planColumnStats, topLevelRows, type NewStats } from "../drift/compareSql.js";
import { overallTarget } from "../drift/overallTarget.js";
import { worst } from "../drift/status.js";
import { resolveThresholds } from "../drift/thresholds.js";
import type { DriftReport, DriftTarget, DriftThresholds } from "../drift/types.js";
import { loadPlanLevels, readPlan } from "../plan/load.js";
import { toolVersion } from "./scan.js";

export type { DriftReport } from "../drift/types.js";

export interface DriftOptions extends EngineOptions, SourceOptions {
  thresholds?: Partial<DriftThresholds>;
  /** Called with the engine while the pass runs (progress display, cancellation). */
  onEngine?: (engine: Engine | null) => void;
}

const COMPARED_ROLES = new Set(["categorical", "identifier", "constant"]);
const NO_NEW: NewStats = { rows: 0, missing: 0, levels: 0, n_y: 0, sum_y: 0, sum_y2: 0, unseen_rows: 0, new_levels: 0 };

/**
 * Checks `inputs` (a newer extract) against the plan at `planPath` (a profile.json or its folder).
 * @throws TailsiftError (exit 2) for a missing plan, a plan without levels.parquet, unreadable or
 *   empty input, or bad thresholds.
 */
export async function drift(inputs: readonly string[], planPath: string, options: DriftOptions = {}): Promise<DriftReport> {
  const thresholds = resolveThresholds(options.thresholds);
  const { profilePath, levelsPath, profile } = readPlan(planPath, "drift", true);
  const lockToPaths = options.lockToPaths ?? [...inputs, path.dirname(path.resolve(profilePath))];
  return withEngine({ ...options, lockToPaths }, async (engine) => {
    options.onEngine?.(engine);
    try {
      await loadPlanLevels(engine, levelsPath, "drift");
      return await compare(engine, inputs, profile, profilePath, thresholds, options);
    } finally {
      options.onEngine?.(null);
    }
  });
}

async function compare(
  engine: Engine, inputs: readonly string[], profile: Profile, profilePath: string,
  thresholds: DriftThresholds, options: DriftOptions,
): Promise<DriftReport> {
  const source = await openSource(engine, inputs, { ...options, missingLike: planMissingLike(profile.settings.missingLike, options.missingLike, false) });
  // numeric identifiers (numericValues set) have no levels in the plan's level table
  const compared = profile.columns.filter((c) => COMPARED_ROLES.has(c.role) && c.numericValues === undefined);
  const present = compared.filter((c) => source.columns.includes(c.name));
  // a multi-class target is compared by its class distribution (drift/classDrift), not as a y
  const planTarget = profile.target?.kind === "multiclass" ? undefined : profile.target;
  const targetSpec: TargetSpec | undefined = planTarget && source.columns.includes(planTarget.column)
    ? { column: planTarget.column, kind: planTarget.kind, ...(planTarget.positive !== undefined ? { positive: planTarget.positive } : {}) }
    : undefined;

  // Folds play no part in drift: every row in fold 0.
  const totals = await buildLevelTable(engine, {
    view: source.view, levelColumns: present.map((c) => c.name),
    countColumns: [], ...(targetSpec ? { target: targetSpec } : {}), fold: singleFold(),
  }, `reading ${describeFiles(source.files)}`);
  if (totals.rows === 0) throw new TailsiftError("empty_input", `${describeFiles(source.files)} has a header but no rows`);

  await nameNewLevels(engine, present.map((c) => c.name));
  const planStats = await planColumnStats(engine);
  const newStats = await newColumnStats(engine);
  const top = profile.settings.top ?? 20;
  const tops = await topLevelRows(engine, top);
  const targetContext: TargetContext | null = targetSpec && planTarget
    ? { column: planTarget.column, kind: planTarget.kind, planSd: planTarget.sd ?? null }
    : null;

  const columns = compared.map((c: ColumnProfile) => {
    if (!source.columns.includes(c.name)) return missingColumnDrift(c);
    const plan = planStats.get(c.name);
    if (!plan) {
      throw new TailsiftError("plan_levels_mismatch", `the plan's level table has no rows for column '${c.name}'; rescan with scan --out`);
    }
    return presentColumnDrift(c, plan, newStats.get(c.name) ?? NO_NEW, tops.get(c.name) ?? [], targetContext, thresholds);
  });

  const first = [...planStats.values()][0];
  const target: DriftTarget | undefined = targetContext && planTarget
    ? overallTarget(planTarget, first ? { n: first.n_y, sum: first.sum_y, sum2: first.sum_y2 } : undefined,
      { n: totals.targetRows, sum: totals.sumY, sum2: totals.sumY2, bad: totals.badTargets })
    : undefined;

  const mc = profile.target?.kind === "multiclass" && source.columns.includes(profile.target.column) ? profile.target : undefined;
  // every value of the target, counted (the cap only bounds what comes back: far more than any plan's classes)
  const classes = mc ? classDrift(mc, await engine.rows<{ v: string; n: number }>(classesSql(source.view, mc.column, 100_000), `counting the classes of '${mc.column}'`), thresholds) : undefined;
  const known = new Set(profile.columns.map((c) => c.name));
  return {
    tool: { name: "tailsift", version: toolVersion() },
    createdAt: new Date().toISOString(),
    plan: {
      path: profilePath, createdAt: profile.createdAt, paths: profile.input.paths, rows: profile.input.rows,
      fingerprint: profile.input.fingerprint, top,
      ...(profile.target ? { target: { column: profile.target.column, kind: profile.target.kind, mean: profile.target.mean } } : {}),
    },
    input: {
      paths: source.files, rows: totals.rows, bytes: source.bytes, fingerprint: source.fingerprint, format: source.format,
      missingColumns: compared.filter((c) => !source.columns.includes(c.name)).map((c) => c.name),
      newColumns: source.columns.filter((c) => !known.has(c)),
    },
    thresholds,
    ...(target ? { target } : {}),
    ...(classes ? { classes } : {}),
    columns,
    status: worst([...columns.map((c) => c.status), target?.status ?? "ok", classes?.status ?? "ok"]),
  };
}
