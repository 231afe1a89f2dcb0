/**
 * plan/load: the one loader of a plan folder — the profile.json written by `scan --out` and the
 * files beside it (levels.parquet: one row per column, level and fold). `encode`, `drift` and
 * `report` all read plans through here, and every message names the command that asked, so a
 * user of `encode` is not told what "drift needs".
 *
 * `--plan` may name the profile.json or the folder that holds it.
 */
import fs from "node:fs";
import path from "node:path";
import type { Engine } from "../engine/db.js";
import { LEVEL_FILE_NAME } from "../engine/levelFile.js";
import { quoteLiteral } from "../engine/sql.js";
import { TailsiftError } from "../errors.js";
import { readProfile } from "../profile/readProfile.js";
import { verifyPlanSet } from "./integrity.js";
import type { Profile } from "../profile/types.js";

export const PROFILE_FILE_NAME = "profile.json";

/** The command reading the plan, named in every message. */
export type PlanReader = "encode" | "drift" | "report" | "sql";

export interface PlanFiles {
  folder: string;
  profilePath: string;
  /** levels.parquet beside the profile; absent only when the reader does not need it. */
  levelsPath?: string;
}

export interface LoadedPlan extends PlanFiles {
  profile: Profile;
}

/** The profile's path: `plan` itself, or profile.json inside the folder `plan`. */
function profilePathOf(plan: string, reader: PlanReader): string {
  let isDir: boolean;
  try {
    isDir = fs.statSync(plan).isDirectory();
  } catch {
    throw new TailsiftError("plan_not_found", `${reader}: plan '${plan}' not found; give the profile.json written by scan --out, or its folder`);
  }
  const profilePath = isDir ? path.join(plan, PROFILE_FILE_NAME) : plan;
  if (!fs.existsSync(profilePath)) {
    throw new TailsiftError("plan_not_found", `${reader}: plan folder '${plan}' has no ${PROFILE_FILE_NAME}; give the profile.json written by scan --out`);
  }
  return profilePath;
}

/**
 * Finds, reads and validates a plan. The profile is read before the level table is looked for,
 * so a file that is not a profile says that first.
 * @throws TailsiftError (exit 2) `plan_not_found`, `input_not_found`, `bad_profile`, and
 *   `plan_without_levels` when `needsLevels` and levels.parquet is not beside the profile.
 */
export function readPlan(plan: string, reader: PlanReader, needsLevels: true): LoadedPlan & { levelsPath: string };
export function readPlan(plan: string, reader: PlanReader, needsLevels: boolean): LoadedPlan;
export function readPlan(plan: string, reader: PlanReader, needsLevels: boolean): LoadedPlan {
  const profilePath = profilePathOf(plan, reader);
  const profile = readProfile(profilePath);
  const folder = path.dirname(profilePath);
  const levelsPath = path.join(folder, LEVEL_FILE_NAME);
  const hasLevels = fs.existsSync(levelsPath);
  if (needsLevels && !hasLevels) {
    throw new TailsiftError("plan_without_levels",
      `${reader}: plan folder '${folder}' has no ${LEVEL_FILE_NAME} beside ${PROFILE_FILE_NAME}; ${reader} needs the level table that scan --out writes there (rescan with --out)`);
  }
  // the plan's files belong together (one scan, plan/integrity): encode, drift, report and sql all
  // refuse a mixed set the same way
  verifyPlanSet(profilePath);
  return { folder, profilePath, profile, ...(hasLevels ? { levelsPath } : {}) };
}

/** The plan's level table, summed over folds: (name, level, rows, n_y, sum_y, sum_y2), level NULL = missing. */
export const PLAN_LEVELS = "tailsift_plan_levels";

const NEEDED = ["column", "level", "fold", "rows", "n_y", "sum_y", "sum_y2"];

/** SQL reading the plan's per-fold level rows of `names` (every column when absent). */
export function planLevelRowsSql(levelsPath: string, names?: readonly string[]): string {
  const where = names === undefined ? "" : ` WHERE "column" IN (${names.length === 0 ? "NULL" : names.map(quoteLiteral).join(", ")})`;
  return `SELECT * FROM read_parquet(${quoteLiteral(levelsPath)})${where}`;
}

/**
 * Loads levels.parquet into PLAN_LEVELS, summed over folds. `names` limits it to those columns
 * (the file may also hold identifier columns with millions of levels) and requires each to be
 * there. Only this table's size grows with the number of levels, and it stays in DuckDB.
 * @throws TailsiftError `bad_level_table` when the file lacks a needed field or one of `names`.
 */
export async function loadPlanLevels(engine: Engine, levelsPath: string, reader: PlanReader, names?: readonly string[]): Promise<void> {
  const doing = `reading the plan's level table '${levelsPath}'`;
  const described = await engine.rows<{ column_name: string }>(`DESCRIBE SELECT * FROM read_parquet(${quoteLiteral(levelsPath)})`, doing);
  const have = new Set(described.map((d) => d.column_name));
  const lacking = NEEDED.filter((c) => !have.has(c));
  if (lacking.length > 0) {
    throw new TailsiftError("bad_level_table", `${reader}: '${levelsPath}' is not a tailsift level table (no ${lacking.join(", ")}); rescan with scan --out`);
  }
  // a multi-class scan's table also holds each class's rows (sum_c0 …, engine/levelFile): kept
  const classes = [...have].filter((c) => /^sum_c\d+$/.test(c)).sort((a, b) => Number(a.slice(5)) - Number(b.slice(5))).map((c) => `, sum(${c})::DOUBLE AS ${c}`).join("");
  await engine.run(
    `CREATE OR REPLACE TEMP TABLE ${PLAN_LEVELS} AS
     SELECT "column" AS name, level, sum(rows)::BIGINT AS rows, sum(n_y)::BIGINT AS n_y,
            sum(sum_y)::DOUBLE AS sum_y, sum(sum_y2)::DOUBLE AS sum_y2${classes}
     FROM (${planLevelRowsSql(levelsPath, names)}) GROUP BY ALL`, doing);
  if (names === undefined) return;
  const rows = await engine.rows<{ name: string }>(`SELECT DISTINCT name FROM ${PLAN_LEVELS}`, doing);
  const found = new Set(rows.map((r) => r.name));
  const absent = names.filter((n) => !found.has(n));
  if (absent.length > 0) {
    throw new TailsiftError("bad_level_table", `${reader}: '${levelsPath}' has no levels of ${absent.map((n) => `'${n}'`).join(", ")}; it belongs to another scan — rescan with --out`);
  }
}
