/**
 * drift/planFiles: finds a plan's files and loads its level table. A plan is the profile.json
 * written by `scan --out` plus the levels.parquet beside it (one row per column, level and fold);
 * `--plan` may name the profile.json or the folder that holds it.
 */
import fs from "node:fs";
import path from "node:path";
import type { Engine } from "../engine/db.js";
import { LEVEL_FILE_NAME } from "../engine/levelFile.js";
import { TailsiftError } from "../errors.js";
import { verifyPlanSet } from "../plan/integrity.js";

export const PLAN_LEVELS = "tailsift_plan_levels";
const NEEDED = ["column", "level", "rows", "n_y", "sum_y", "sum_y2"];

/** The profile and level-table paths of a plan; a TailsiftError (exit 2) when either is absent. */
export function locatePlan(plan: string): { profilePath: string; levelsPath: string } {
  let profilePath = plan;
  try {
    if (fs.statSync(plan).isDirectory()) profilePath = path.join(plan, "profile.json");
  } catch {
    throw new TailsiftError("plan_not_found", `plan '${plan}' not found; give the profile.json written by scan --out`);
  }
  if (!fs.existsSync(profilePath)) {
    throw new TailsiftError("plan_not_found", `plan folder '${plan}' has no profile.json; give the profile.json written by scan --out`);
  }
  const levelsPath = path.join(path.dirname(profilePath), LEVEL_FILE_NAME);
  if (!fs.existsSync(levelsPath)) {
    throw new TailsiftError("plan_without_levels",
      `plan '${profilePath}' has no ${LEVEL_FILE_NAME} beside it; drift needs the level table that scan --out writes there (rescan with --out)`);
  }
  verifyPlanSet(profilePath); // the files belong to one scan (plan/integrity); H2's plan/load takes this hook
  return { profilePath, levelsPath };
}

/**
 * Loads the plan's level table into `tailsift_plan_levels(name, level, rows, n_y, sum_y, sum_y2)`,
 * summed over folds (level NULL = missing). Only this table's size grows with the number of
 * levels, and it stays in DuckDB.
 */
export async function loadPlanLevels(engine: Engine, levelsPath: string): Promise<void> {
  const doing = `reading the plan's level table '${levelsPath}'`;
  const described = await engine.rows<{ column_name: string }>(
    "DESCRIBE SELECT * FROM read_parquet($path)", doing, { path: levelsPath });
  const have = new Set(described.map((d) => d.column_name));
  const lacking = NEEDED.filter((c) => !have.has(c));
  if (lacking.length > 0) {
    throw new TailsiftError("bad_level_table", `'${levelsPath}' is not a tailsift level table (no ${lacking.join(", ")}); rescan with scan --out`);
  }
  await engine.run(
    `CREATE OR REPLACE TEMP TABLE ${PLAN_LEVELS} AS
     SELECT "column" AS name, level, sum(rows)::BIGINT AS rows, sum(n_y)::BIGINT AS n_y,
            sum(sum_y)::DOUBLE AS sum_y, sum(sum_y2)::DOUBLE AS sum_y2
     FROM read_parquet($path) GROUP BY ALL`, doing, { path: levelsPath });
}
