/**
 * encode/outputColumns: every column of the output, in output order, with the name written, the
 * raw name it comes from, the input column (and level) it holds and its type. This list is the
 * map from output name to (column, level) that the manifest (`output.map`) and the summary
 * (`outputColumns`) carry. Names are safe by default (encode/safeNames), raw with --raw-names;
 * in CSV/TSV a formula-like header cell is guarded (encode/cellGuard).
 */
import { TailsiftError } from "../errors.js";
import type { TargetSpec } from "../engine/target.js";
import { guardHeader } from "./cellGuard.js";
import { encoderFor } from "./encodings/registry.js";
import { textName } from "./names.js";
import { passSqlType } from "./passThrough.js";
import type { ColumnPlan } from "./planColumns.js";
import { safeOutputNames } from "./safeNames.js";
import type { EncodedColumn, OutputColumn } from "./types.js";

export interface NamingOptions {
  /** Training: the fold column's (raw) name; undefined when scoring. */
  foldColumn: string | undefined;
  rawNames: boolean;
  /** CSV/TSV with the cell guard on: guard header cells. */
  guardHeaders: boolean;
  target: TargetSpec | undefined;
}

/** What each output column of an encoded column holds: (level) for one-hot, the pooled column, … */
function encodedOutputs(column: EncodedColumn): Omit<OutputColumn, "name">[] {
  const encoder = encoderFor(column);
  const holds = encoder.outputHolds(column);
  return encoder.outputNames(column).map((rawName, k) => ({ rawName, column: column.name, kind: "encoded" as const, ...holds[k], type: encoder.outputType }));
}

/**
 * The output columns in order (aligned with `plan.names`).
 * @throws TailsiftError `name_clash` when two written names would still be equal (a guarded
 *   raw header equal to another raw header).
 */
export function outputColumns(plan: ColumnPlan, o: NamingOptions): OutputColumn[] {
  const described: Omit<OutputColumn, "name">[] = [];
  for (const item of plan.outputs) {
    if (item.kind === "pass") described.push({ rawName: item.column, column: item.column, kind: "pass", type: passSqlType(item.type, o.target) });
    else if (item.kind === "text") described.push({ rawName: textName(item.column), column: item.column, kind: "text", type: "VARCHAR" });
    else described.push(...encodedOutputs(item.column));
  }
  if (o.foldColumn !== undefined) described.push({ rawName: o.foldColumn, column: o.foldColumn, kind: "fold", type: "INTEGER" });
  const raw = described.map((d) => d.rawName);
  const names = (o.rawNames ? raw : safeOutputNames(raw)).map((n) => (o.guardHeaders ? guardHeader(n) : n));
  const seen = new Set<string>();
  for (const n of names) {
    if (seen.has(n)) throw new TailsiftError("name_clash", `the output would have two columns named '${n}'; rename the input column or leave it out of --keep`);
    seen.add(n);
  }
  return described.map((d, k) => ({ name: names[k]!, ...d }));
}
