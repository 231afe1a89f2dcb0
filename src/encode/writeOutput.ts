/**
 * encode/writeOutput: the one COPY query that writes the encoded output, the mapping files, the
 * summary counts, and the atomic commit. Everything goes to temporaries beside the destination
 * (the output file is registered in `pendingTemps`, the mappings folder removed in `finally`),
 * renamed into place only when complete.
 */
import fs from "node:fs";
import path from "node:path";
import { pendingTemps, tempPathFor } from "../files/temp.js";
import { toolVersion } from "../version.js";
import type { Engine } from "../engine/db.js";
import type { FoldContract } from "../engine/folds.js";
import type { Source } from "../engine/source.js";
import { quoteIdent, quoteLiteral } from "../engine/sql.js";
import { NEGATIVE_WORDS, POSITIVE_WORDS, targetSql, type TargetSpec } from "../engine/target.js";
import type { Profile, ProfileTarget } from "../profile/types.js";
import { CELL_GUARD_PREFIX, FORMULA_STARTS, guardCellSql } from "./cellGuard.js";
import { outputColumns } from "./outputColumns.js";
import { passSql, valueErrorOf } from "./passThrough.js";
import { columnCounts, fallbackRule } from "./counts.js";
import { encoderFor } from "./encodings/registry.js";
import { FOLD_FIELD, ref, ROW_FIELD, Y_FIELD } from "./expressions.js";
import type { LookupKind, LookupRef } from "./lookup.js";
import { manifestEntry } from "./manifest.js";
import { mappingBaseNames, writeManifest, writeMappingTable } from "./mappingFiles.js";
import { groupingCounts, groupingOf } from "./hierarchyCounts.js";
import { commitDir, commitFile, mappingsDirFor, outputFormat } from "./outputFile.js";
import type { ColumnPlan } from "./planColumns.js";
import type { ColumnMap, ColumnSummary, EncodeMode, EncodeSummary, OutputColumn } from "./types.js";

export interface WriteContext {
  plan: ColumnPlan;
  maps: Map<number, ColumnMap>;
  lookups: Map<number, LookupRef>;
  lookup: LookupKind;
  levelSource: EncodeSummary["levelSource"];
  source: Source;
  profile: Profile;
  options: { out: string; mode: EncodeMode; foldColumn: string; leaveOneOut?: boolean; rawNames?: boolean; cellGuard?: boolean };
  /** The plan's target (the pass-through target is written as its y). */
  target: TargetSpec | undefined;
  /** Training: the plan's fold contract (read once by commands/encode) and its SQL; null when scoring. */
  folds: { contract: FoldContract; expr: string } | null;
  /** The target whose y the leave-one-out encoding reads, when used. */
  looTarget: TargetSpec | undefined;
}

/** The SELECT that produces the output, in input order, its columns named as `outputs` says. */
export function outputQuery(ctx: WriteContext, outputs: readonly OutputColumn[]): string {
  const { plan, lookups, options: o } = ctx;
  const csv = outputFormat(o.out).format === "csv";
  const guard = csv && (o.cellGuard ?? true);
  const extras: string[] = [];
  if (ctx.folds) extras.push(`${ctx.folds.expr} AS ${quoteIdent(FOLD_FIELD)}`);
  if (ctx.looTarget) extras.push(`${targetSql(ctx.looTarget).y} AS ${quoteIdent(Y_FIELD)}`);
  if (ctx.lookup === "join") extras.push(`row_number() OVER () AS ${quoteIdent(ROW_FIELD)}`);
  const exprs: string[] = [];
  for (const item of plan.outputs) {
    if (item.kind === "pass") exprs.push(passSql(item.column, item.type, { csv, cellGuard: guard, target: ctx.target }));
    else if (item.kind === "text") exprs.push(guard ? guardCellSql(ref(item.column)) : ref(item.column));
    else exprs.push(...encoderFor(item.column).columnSql(item.column, { mode: o.mode, leaveOneOut: o.leaveOneOut ?? false, lookup: lookups.get(item.column.index) ?? null }));
  }
  if (ctx.folds) exprs.push(ref(FOLD_FIELD));
  if (exprs.length !== outputs.length) throw new Error("output columns and expressions are not aligned");
  const items = exprs.map((e, k) => `${e} AS ${quoteIdent(outputs[k]!.name)}`);
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
  const guard = format.format === "csv" && (o.cellGuard ?? true);
  const outputs = outputColumns(plan, { foldColumn: ctx.folds ? o.foldColumn : undefined, rawNames: o.rawNames ?? false, guardHeaders: guard, target: ctx.target });
  pendingTemps.add(tmp);
  try {
    if (ctx.lookup === "join") await engine.run("SET disabled_optimizers = 'build_side_probe_side'", "keeping mapping tables on the build side");
    let copied: { Count: number } | undefined;
    try {
      [copied] = await engine.rows<{ Count: number }>(
        `COPY (${outputQuery(ctx, outputs)}) TO ${quoteLiteral(tmp)} (${format.copyOptions})`, `writing '${o.out}'`);
    } catch (err) {
      throw valueErrorOf(err) ?? err;
    }
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
      const written = outputs.filter((x) => x.kind === "encoded" && x.column === column.name).map((x) => x.name);
      const structure = groupingOf(column.spec);
      const grouping = structure && map?.levelTable ? await groupingCounts(engine, column.name, structure, map.levelTable) : undefined;
      columns.push({
        column: column.name, encoding: column.spec.encoding, outputs: written, ...counts, fallbackRule: rule,
        ...(files.file ? { file: files.file } : {}), ...(grouping ? { grouping } : {}),
      });
      entries.push(await manifestEntry(engine, column, written, files, rule, o.mode, leaveOneOut));
    }
    writeManifest(tmpDir, manifest(ctx, entries, outputs, guard));
    commitFile(tmp, o.out);
    commitDir(tmpDir, mapsDir);
    return {
      mode: o.mode, output: o.out, format: format.format, mappings: mapsDir, rows: copied?.Count ?? 0,
      ...(ctx.folds ? { foldColumn: o.foldColumn } : {}),
      levelSource: ctx.levelSource, lookup: ctx.lookup, columns, outputColumns: outputs,
      names: o.rawNames ? "raw" : "safe", cellGuard: guard ? CELL_GUARD_PREFIX : null,
      passedThrough: plan.passedThrough, dropped: plan.dropped, notInPlan: plan.notInPlan,
    };
  } finally {
    fs.rmSync(tmp, { force: true });
    fs.rmSync(tmpDir, { recursive: true, force: true });
    pendingTemps.delete(tmp);
  }
}

const foldManifest = (column: string, f: FoldContract) =>
  ({ column, k: f.k, seed: f.seed, hash: f.hash, identityColumns: f.keyColumns, ...(f.kind === "grouped" ? { kind: "grouped" } : {}),
    ...(f.kind === "time-blocks" ? {
      kind: "time-blocks", timeColumn: f.timeColumn, boundaries: f.boundaries,
      encodings: "past-only: a row of time block b is target-encoded from the rows of blocks 0..b-1 only (their sums and their mean as the prior); block 0 has no earlier rows and takes the prior (the input's overall target mean; for a multi-class target, its class shares); a missing value takes the earlier blocks' mean (class shares)",
    } : {}) });

function manifest(ctx: WriteContext, entries: Record<string, unknown>[], outputs: readonly OutputColumn[], guard: boolean): Record<string, unknown> {
  const { profile, options: o } = ctx;
  const t = profile.target;
  const typedTarget = t ? outputs.find((x) => x.kind === "pass" && x.column === t.column && x.type !== "VARCHAR") : undefined;
  return {
    tool: { name: "tailsift", version: toolVersion() }, createdAt: new Date().toISOString(),
    mode: o.mode, leaveOneOut: o.leaveOneOut ?? false, levelSource: ctx.levelSource,
    plan: { paths: profile.input.paths, fingerprint: profile.input.fingerprint },
    input: { paths: ctx.source.files, fingerprint: ctx.source.fingerprint },
    output: {
      file: path.basename(o.out), columns: outputs.map((x) => x.name),
      names: o.rawNames ? "raw" : "safe", cellGuard: guard ? { prefix: CELL_GUARD_PREFIX, starts: FORMULA_STARTS } : null,
      map: outputs,
    },
    ...(ctx.folds ? { folds: foldManifest(outputs.find((x) => x.kind === "fold")?.name ?? o.foldColumn, ctx.folds.contract) } : {}),
    ...(t?.kind === "multiclass" ? { target: { column: t.column, kind: t.kind, classes: t.classes.map((c) => c.value) } } : {}),
    ...(t && t.kind !== "multiclass" ? { target: { column: t.column, kind: t.kind, positive: t.positive ?? null, mean: t.mean, ...(typedTarget ? { output: targetOutput(t, typedTarget.name) } : {}) } } : {}),
    columns: entries,
  };
}

/** How the target is written: its output name, type and which values give 1 and 0. */
function targetOutput(t: ProfileTarget, name: string): Record<string, unknown> {
  if (t.kind === "continuous") return { name, type: "DOUBLE", value: "the number (trimmed); empty → NULL" };
  if (t.positive !== undefined) return { name, type: "INTEGER", one: [t.positive], zero: "every other non-empty value", caseSensitive: true, value: "1 for the positive value (trimmed), else 0; empty → NULL" };
  return { name, type: "INTEGER", one: POSITIVE_WORDS, zero: NEGATIVE_WORDS, caseSensitive: false, value: "1 / 0 by the words (trimmed, any case); empty → NULL" };
}
