/**
 * encode/writeOutput: the one COPY query that writes the encoded output, the mapping files, the
 * summary counts, and the atomic commit. Everything goes to temporaries beside the destination
 * (the output file is registered in `pendingTemps`, the mappings folder removed in `finally`),
 * renamed into place only when complete.
 */
import fs from "node:fs";
import path from "node:path";
import { toolVersion } from "../version.js";
import { pendingTemps, tempPathFor } from "../commands/output.js";
import type { Engine } from "../engine/db.js";
import { readFoldContract } from "../engine/folds.js";
import type { Source } from "../engine/source.js";
import { quoteIdent, quoteLiteral } from "../engine/sql.js";
import { targetSql, type TargetSpec } from "../engine/target.js";
import type { Profile } from "../profile/types.js";
import type { ColumnMap } from "./columnMaps.js";
import { columnCounts, fallbackRule } from "./counts.js";
import { columnSql, FOLD_FIELD, ref, ROW_FIELD, Y_FIELD } from "./expressions.js";
import type { LookupKind, LookupRef } from "./lookup.js";
import { manifestEntry } from "./manifest.js";
import { mappingBaseNames, writeManifest, writeMappingTable } from "./mappingFiles.js";
import { outputNames, textName } from "./names.js";
import { groupingCounts, groupingOf } from "./structureCounts.js";
import { commitDir, commitFile, mappingsDirFor, outputFormat } from "./outputFile.js";
import type { ColumnPlan } from "./planColumns.js";
import type { ColumnSummary, EncodeMode, EncodeSummary } from "./types.js";

export interface WriteContext {
  plan: ColumnPlan;
  maps: Map<number, ColumnMap>;
  lookups: Map<number, LookupRef>;
  lookup: LookupKind;
  levelSource: EncodeSummary["levelSource"];
  source: Source;
  profile: Profile;
  options: { out: string; mode: EncodeMode; foldColumn: string; leaveOneOut?: boolean };
  /** The fold expression (training) or null. */
  foldExpr: string | null;
  /** The target whose y the leave-one-out encoding reads, when used. */
  looTarget: TargetSpec | undefined;
}

/** The SELECT that produces the output, in input order. */
export function outputQuery(ctx: WriteContext): string {
  const { plan, lookups, options: o } = ctx;
  const extras: string[] = [];
  if (ctx.foldExpr) extras.push(`${ctx.foldExpr} AS ${quoteIdent(FOLD_FIELD)}`);
  if (ctx.looTarget) extras.push(`${targetSql(ctx.looTarget).y} AS ${quoteIdent(Y_FIELD)}`);
  if (ctx.lookup === "join") extras.push(`row_number() OVER () AS ${quoteIdent(ROW_FIELD)}`);
  const items: string[] = [];
  for (const item of plan.outputs) {
    if (item.kind === "pass") items.push(`${ref(item.column)} AS ${quoteIdent(item.column)}`);
    else if (item.kind === "text") items.push(`${ref(item.column)} AS ${quoteIdent(textName(item.column))}`);
    else {
      const exprs = columnSql(item.column, { mode: o.mode, leaveOneOut: o.leaveOneOut ?? false, lookup: lookups.get(item.column.index) ?? null });
      outputNames(item.column).forEach((name, k) => items.push(`${exprs[k]} AS ${quoteIdent(name)}`));
    }
  }
  if (ctx.foldExpr) items.push(`${ref(FOLD_FIELD)} AS ${quoteIdent(o.foldColumn)}`);
  const joins = [...lookups.values()].map((l) => l.join).filter((j): j is string => j !== null);
  const inner = `SELECT *${extras.map((e) => `, ${e}`).join("")} FROM ${ctx.source.view}`;
  const order = ctx.lookup === "join" ? `\nORDER BY ${ref(ROW_FIELD)}` : "";
  return `SELECT ${items.join(",\n  ")}\nFROM (${inner}) AS s${joins.map((j) => `\n${j}`).join("")}${order}`;
}

/** Writes the output and its mappings folder atomically and returns the summary. */
export async function writeOutput(engine: Engine, ctx: WriteContext): Promise<EncodeSummary> {
  const { plan, maps, options: o } = ctx;
  const leaveOneOut = o.leaveOneOut ?? false;
  const format = outputFormat(o.out);
  const mapsDir = mappingsDirFor(o.out);
  const tmp = tempPathFor(o.out);
  const tmpDir = tempPathFor(mapsDir);
  const bases = mappingBaseNames(plan.encoded.map((c) => c.name));
  const columns: ColumnSummary[] = [];
  const entries: Record<string, unknown>[] = [];
  pendingTemps.add(tmp);
  try {
    if (ctx.lookup === "join") await engine.run("SET disabled_optimizers = 'build_side_probe_side'", "keeping mapping tables on the build side");
    const [copied] = await engine.rows<{ Count: number }>(
      `COPY (${outputQuery(ctx)}) TO ${quoteLiteral(tmp)} (${format.copyOptions})`, `writing '${o.out}'`);
    fs.rmSync(tmpDir, { recursive: true, force: true });
    fs.mkdirSync(tmpDir);
    for (const column of plan.encoded) {
      const map = maps.get(column.index) ?? null;
      const files: Record<string, string> = {};
      for (const f of map?.files ?? []) {
        const file = `${bases[column.index]}${f.suffix}.parquet`;
        await writeMappingTable(engine, f.table, tmpDir, file, f.order);
        files[f.key] = file;
      }
      const rule = fallbackRule(column, o.mode, leaveOneOut);
      const counts = await columnCounts(engine, column, map, o.mode, leaveOneOut);
      const outputs = outputNames(column);
      const structure = groupingOf(column.spec);
      const grouping = structure && map?.levelTable ? await groupingCounts(engine, column.name, structure, map.levelTable) : undefined;
      columns.push({
        column: column.name, encoding: column.spec.encoding, outputs, ...counts, fallbackRule: rule,
        ...(files.file ? { file: files.file } : {}), ...(grouping ? { grouping } : {}),
      });
      entries.push(await manifestEntry(engine, column, outputs, files, rule, o.mode, leaveOneOut));
    }
    writeManifest(tmpDir, manifest(ctx, entries));
    commitFile(tmp, o.out);
    commitDir(tmpDir, mapsDir);
    return {
      mode: o.mode, output: o.out, format: format.format, mappings: mapsDir, rows: copied?.Count ?? 0,
      ...(ctx.foldExpr ? { foldColumn: o.foldColumn } : {}),
      levelSource: ctx.levelSource, lookup: ctx.lookup, columns,
      passedThrough: plan.passedThrough, dropped: plan.dropped, notInPlan: plan.notInPlan,
    };
  } finally {
    fs.rmSync(tmp, { force: true });
    fs.rmSync(tmpDir, { recursive: true, force: true });
    pendingTemps.delete(tmp);
  }
}

const foldManifest = (column: string, f: { kind: string; k: number; seed: number; hash: string; keyColumns: string[] }) =>
  ({ column, k: f.k, seed: f.seed, hash: f.hash, identityColumns: f.keyColumns, ...(f.kind === "grouped" ? { kind: "grouped" } : {}) });

function manifest(ctx: WriteContext, entries: Record<string, unknown>[]): Record<string, unknown> {
  const { profile, options: o } = ctx;
  const t = profile.target;
  return {
    tool: { name: "tailsift", version: toolVersion() }, createdAt: new Date().toISOString(),
    mode: o.mode, leaveOneOut: o.leaveOneOut ?? false, levelSource: ctx.levelSource,
    plan: { paths: profile.input.paths, fingerprint: profile.input.fingerprint },
    input: { paths: ctx.source.files, fingerprint: ctx.source.fingerprint },
    output: { file: path.basename(o.out), columns: ctx.plan.names },
    ...(ctx.foldExpr ? { folds: foldManifest(o.foldColumn, readFoldContract(profile.settings)) } : {}),
    ...(t ? { target: { column: t.column, kind: t.kind, positive: t.positive ?? null, mean: t.mean } } : {}),
    columns: entries,
  };
}
