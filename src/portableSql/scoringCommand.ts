/**
 * portableSql/scoringCommand: `tailsift sql --plan DIR --from TABLE`: reads the plan, builds its
 * scoring mappings in DuckDB, prints the scoring query, and (with mappingsOut) writes the
 * mapping tables too large to inline as CSV files (level,value; RFC 4180 quoting, header),
 * into a new folder that appears only when complete.
 */
import fs from "node:fs";
import path from "node:path";
import { withEngine } from "../engine/db.js";
import { planMissingLike } from "../engine/missingLike.js";
import { TailsiftError } from "../errors.js";
import { readPlan } from "../plan/load.js";
import type { TargetSpec } from "../engine/target.js";
import type { Profile } from "../profile/types.js";
import { dialectOf, type DialectName } from "./dialects.js";
import { scoringItems } from "./planMaps.js";
import { DEFAULT_INLINE_MAX, scoringSql, type MappingTable } from "./scoringSql.js";

export interface ScoringQueryOptions {
  plan: string;
  from: string;
  dialect?: DialectName;
  /** Mappings with at most this many rows are inlined (default DEFAULT_INLINE_MAX). */
  inlineMax?: number;
  /** Folder (new) for the CSV files of the tables that are not inlined. */
  mappingsOut?: string;
  /** Name the output columns with encode's raw names (as `encode --raw-names`) instead of its safe names. */
  rawNames?: boolean;
}

const csvField = (s: string) => `"${s.replaceAll('"', '""')}"`;

function writeMappingFiles(dir: string, tables: readonly MappingTable[]): void {
  if (fs.existsSync(dir)) throw new TailsiftError("bad_option", `--mappings-out '${dir}' already exists; give a new folder`);
  const tmp = `${dir}.tmp-${process.pid}`;
  fs.rmSync(tmp, { recursive: true, force: true });
  fs.mkdirSync(tmp, { recursive: true });
  try {
    for (const t of tables) {
      const body = t.rows.map((r) => `${csvField(r.key)},${String(r.value)}\n`).join("");
      fs.writeFileSync(path.join(tmp, `${t.name}.csv`), `level,value\n${body}`);
    }
    fs.renameSync(tmp, dir);
  } finally {
    fs.rmSync(tmp, { recursive: true, force: true });
  }
}

/** The plan's target as the scoring SQL reads it (a multi-class target: its column and kind; its classes are labels). */
function targetOfPlan(t: Profile["target"]): TargetSpec | undefined {
  if (t === undefined) return undefined;
  if (t.kind === "multiclass") return { column: t.column, kind: "multiclass", classes: t.classes.map((c) => c.value) };
  return t;
}

/** The scoring SQL (ends with a newline) and the tables the user loads. */
export async function scoringQuery(o: ScoringQueryOptions): Promise<{ sql: string; tables: MappingTable[] }> {
  const inlineMax = o.inlineMax ?? DEFAULT_INLINE_MAX;
  if (!Number.isInteger(inlineMax) || inlineMax < 0) throw new TailsiftError("bad_option", `--inline-max must be a whole number ≥ 0 (got ${inlineMax})`);
  const { levelsPath, profile } = readPlan(o.plan, "sql", true);
  const items = await withEngine({ threads: 1, lockToPaths: [path.dirname(path.resolve(levelsPath))] }, (engine) => scoringItems(engine, profile, levelsPath));
  const missingLike = planMissingLike(profile.settings.missingLike, undefined, false);
  const result = scoringSql(items, { from: o.from, dialect: dialectOf(o.dialect), inlineMax, missingLike, rawNames: o.rawNames ?? false, target: targetOfPlan(profile.target) });
  if (result.tables.length > 0) {
    if (o.mappingsOut === undefined) {
      const t = result.tables[0]!;
      throw new TailsiftError("bad_option", `the mapping of '${t.column}' (${t.role}) has ${t.rows.length} rows, more than --inline-max ${inlineMax}; give --mappings-out DIR to write the tables to load, or raise --inline-max`);
    }
    writeMappingFiles(o.mappingsOut, result.tables);
  }
  return result;
}
