/**
 * encode/mappingFiles: the mappings written beside the output (`OUT.mappings/`), so a model
 * served elsewhere can reproduce each encoding without tailsift:
 *  - `mappings.json`: one entry per encoded column — encoding, output columns, parameters
 *    (levels, width, salt, m, p …), the fallback rule and the file holding its table, plus the
 *    fold settings of a training run;
 *  - `<column>.parquet` (frequency, codes, target): (level, rows, …, value), one row per level;
 *    a training run's target encoding adds `<column>.folds.parquet` (level, fold, n_other,
 *    sum_other, prior_other, value) — the out-of-fold values the training rows received;
 *    backoff adds `<column>.groups.parquet` (one row per group), the hierarchical prior
 *    `<column>.parents.parquet` (one row per parent) — see encode/hierarchyMaps;
 *  - hashing of backoff groups: `<column>.parquet` (level, seen, rows, depth, group_key, bucket),
 *    one row per plan and input level, bucket 0..width − 1, or width for "other" — see
 *    encode/hashedGroupMap.
 * File names keep letters, digits, '.', '_' and '-' of the column name (others become '_'),
 * with `-<n>` appended when two columns would share a name.
 */
import fs from "node:fs";
import path from "node:path";
import type { Engine } from "../engine/db.js";
import { quoteLiteral } from "../engine/sql.js";

export const MANIFEST_NAME = "mappings.json";

/** Chooses a distinct, filesystem-safe base name per column. */
export function mappingBaseNames(columns: readonly string[]): string[] {
  const used = new Set<string>();
  return columns.map((c, i) => {
    let base = c.replace(/[^A-Za-z0-9._-]/g, "_");
    if (base === "" || base === "." || base === ".." || base.toLowerCase() === MANIFEST_NAME.replace(".json", "")) base = `_${base}`;
    if (used.has(base.toLowerCase())) base = `${base}-${i}`;
    used.add(base.toLowerCase());
    return base;
  });
}

/**
 * A table written beside the output as `<column><suffix>.parquet` ("" = the main file), named
 * in the manifest entry under `key`, rows in `order` (SQL) for a stable file.
 */
export interface MappingFile { suffix: string; table: string; key: string; order: string }

export const mainFile = (table: string): MappingFile => ({ suffix: "", table, key: "file", order: "level" });
export const foldFile = (table: string): MappingFile => ({ suffix: ".folds", table, key: "foldFile", order: "level, fold" });

/** Writes `table` as Parquet to `dir/file`, rows in `order`. */
export async function writeMappingTable(engine: Engine, table: string, dir: string, file: string, order: string): Promise<void> {
  await engine.run(
    `COPY (SELECT * FROM ${table} ORDER BY ${order}) TO ${quoteLiteral(path.join(dir, file))} (FORMAT parquet, COMPRESSION zstd)`,
    `writing the mapping '${file}'`);
}

/** Writes the manifest (pretty JSON) into `dir`. */
export function writeManifest(dir: string, manifest: unknown): void {
  fs.writeFileSync(path.join(dir, MANIFEST_NAME), `${JSON.stringify(manifest, null, 2)}\n`);
}
