/**
 * encode/summaryTable: the end-of-run summary of `tailsift encode` as a terminal table (printed
 * on stderr, so stdout stays free for data): one row per encoded column with its missing,
 * unseen and fallback rows and what they received, and one line per backoff or hierarchical
 * column saying where its levels went.
 */
import Table from "cli-table3";
import { formatCount, formatShare } from "../render/format.js";
import type { EncodeSummary, GroupingCounts, LevelRows } from "./types.js";

const share = (n: number, rows: number) => (rows > 0 ? ` (${formatShare(n / rows)})` : "");

const levels = (x: LevelRows) => `${formatCount(x.levels)} level${x.levels === 1 ? "" : "s"} (${formatCount(x.rows)} rows)`;

/** "code: backoff — 40 levels (900 rows) own group, 120 levels (300 rows) to a parent, …". */
function groupingLine(column: string, g: GroupingCounts): string {
  const [own, parent, other] = g.kind === "backoff" ? ["own group", "backed off to a parent", "to \"other\""] : ["own mean", "parent's mean", "prior"];
  return `${column}: ${g.kind === "backoff" ? "backoff grouping" : "hierarchical prior"} — ${levels(g.own)} ${own}, ${levels(g.parent)} ${parent}, ${levels(g.other)} ${other}; ${levels(g.unseen)} unseen`;
}

/** Renders the summary: a header line, the per-column table and the pass-through lists. */
export function renderEncodeSummary(s: EncodeSummary): string {
  const head = `encoded ${formatCount(s.rows)} rows for ${s.mode} → ${s.output} (${s.format})` +
    (s.foldColumn ? `, folds in '${s.foldColumn}'` : "") + `; mappings in ${s.mappings}`;
  const table = new Table({
    head: ["column", "encoding", "outputs", "missing", "unseen", "fallback", "missing / unseen / fallback get"],
    style: { head: [], border: [], compact: true },
  });
  for (const c of s.columns) {
    const outputs = c.outputs.length === 1 ? c.outputs[0] ?? "" : `${c.outputs.length} columns`;
    table.push([c.column, c.encoding, outputs, formatCount(c.missing) + share(c.missing, s.rows),
      formatCount(c.unseen) + share(c.unseen, s.rows), formatCount(c.fallback) + share(c.fallback, s.rows), c.fallbackRule]);
  }
  const lines = [head];
  if (s.columns.length > 0) lines.push(table.toString());
  for (const c of s.columns) if (c.grouping) lines.push(groupingLine(c.column, c.grouping));
  if (s.mode === "training" && s.levelSource !== "none") lines.push(`level sums from: ${s.levelSource}`);
  const renamed = s.outputColumns.filter((c) => c.name !== c.rawName);
  if (renamed.length > 0) {
    const first = renamed[0]!;
    lines.push(`${s.names === "safe" ? "safe names" : "guarded header cells"}: ${formatCount(renamed.length)} output column${renamed.length === 1 ? "" : "s"} renamed, e.g. '${first.rawName}' → '${first.name}'; the map is in mappings.json (output.map)`);
  }
  if (s.passedThrough.length > 0) lines.push(`passed through: ${s.passedThrough.join(", ")}`);
  if (s.dropped.length > 0) lines.push(`dropped by the plan: ${s.dropped.join(", ")}`);
  if (s.notInPlan.length > 0) lines.push(`not in the plan, left out (--keep passes them through): ${s.notInPlan.join(", ")}`);
  return `${lines.join("\n")}\n`;
}
