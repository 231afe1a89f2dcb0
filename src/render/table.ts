/**
 * render/table: the terminal view of a profile — one row per column (cli-table3). Colour is off
 * so output is the same in a pipe, a terminal and a test.
 */
import Table from "cli-table3";
import type { ColumnProfile, Profile } from "../profile/types.js";
import { formatCount, formatNumber, formatShare } from "./format.js";
import { numericValuesText, placeholderShareText, timeRangeText } from "./passThroughFigures.js";

function keyParams(c: ColumnProfile): string {
  const rec = c.recommendation;
  switch (rec.encoding) {
    // a saved profile may have been edited: lists are read defensively
    case "one-hot": return `${Array.isArray(rec.params.levels) ? rec.params.levels.length : 0} cols`;
    case "pooled-one-hot": return `${Array.isArray(rec.params.keep) ? rec.params.keep.length : 0}+other, pooled ${formatShare(rec.params.pooledRowShare)}`;
    case "target-kfold": {
      const p = rec.params;
      if ("classes" in p && Array.isArray(p.classes)) return `${p.classes.length} classes, K=${String(p.folds ?? "")}`;
      const how = p.grouping === "backoff" ? `backoff ${formatCount(p.groups)} groups, ` : p.prior === "hierarchical" ? "hierarchical, " : "";
      return `${how}m=${p.weight === null ? "∞" : formatNumber(p.weight, 1)}, K=${String(p.folds ?? "")}`;
    }
    case "hashing": return `${rec.params.grouping === "backoff" ? "backoff groups, " : ""}w=${formatCount(rec.params.width)}, coll ${formatShare(rec.params.collisionRowShare, 2)}`;
    case "frequency": return `${formatCount(rec.params.tableSize)} levels`;
    case "codes": return `${rec.params.grouping === "backoff" ? "backoff groups, " : ""}${formatCount(rec.params.tableSize)} codes`;
    default: return timeRangeText(c) ?? "";
  }
}

function rateRange(c: ColumnProfile): string {
  const rates = c.topLevels.map((l) => l.targetMean).filter((x): x is number => typeof x === "number");
  if (rates.length === 0) return "";
  return `${formatNumber(Math.min(...rates), 3)}–${formatNumber(Math.max(...rates), 3)}`;
}

/** The per-column table printed by `scan`. */
export function renderTable(profile: Profile): string {
  const withTarget = profile.target !== undefined;
  // the missing-like column (rows of placeholder levels) appears only when some column has them
  const placeholders = profile.columns.some((c) => c.placeholders !== undefined);
  const head = ["column", "role", "distinct", "missing", ...(placeholders ? ["missing-like"] : []), "top-1", "95% levels", "unseen", ...(withTarget ? ["top rates", "m", "AUC in/oof"] : []), "advice", "params"];
  if (withTarget && profile.target?.kind === "continuous") head[head.indexOf("AUC in/oof")] = "R² in/oof";
  // a multi-class target: m per class (in class order) and the multi-class log loss of the class shares / target encoding
  const multiclass = profile.target?.kind === "multiclass";
  if (multiclass) head.splice(head.indexOf("top rates"), 3, "m per class", "log loss shares/enc");
  // --time: forward figures beside (unseen: Good–Turing / forward share; leakage: in / oof / forward)
  const forward = profile.settings.fold?.kind === "time-blocks";
  if (forward) {
    head[head.indexOf("unseen")] = "unseen GT/fwd";
    if (withTarget) head[head.length - 3] += "/fwd";
  }
  const table = new Table({ head, style: { head: [], border: [], compact: true } });
  for (const c of profile.columns) {
    const measured = c.role !== "numeric" && c.role !== "time" && c.role !== "target" && c.role !== "excluded" && c.numericValues === undefined;
    const row: string[] = [
      c.name, c.role,
      measured ? formatCount(c.distinct) : (numericValuesText(c)?.replace(/ \(.*\)$/, "") ?? ""),
      formatShare(c.rows > 0 ? c.missing / c.rows : 0),
      ...(placeholders ? [placeholderShareText(c)] : []),
      measured ? formatShare(c.topLevels[0]?.share ?? 0) : "",
      measured ? formatCount(c.coverage.find((x) => x.share === 0.95)?.levels ?? 0) : "",
      measured ? formatShare(c.unseenRate, 2) + (forward && c.forwardUnseen ? `/${formatShare(c.forwardUnseen.mean, 2)}` : "") : "",
    ];
    if (multiclass) {
      const e = c.multiclassEvidence;
      row.push(c.classes ? c.classes.map((k) => (k.target.prior.weight === null ? "∞" : formatNumber(k.target.prior.weight, 1))).join("/") : "",
        e ? `${formatNumber(e.candidates[0]?.loss, 3)}/${formatNumber(e.candidates[1]?.loss, 3)}` : "");
    } else if (withTarget) {
      const t = c.target;
      row.push(rateRange(c), t ? (t.prior.weight === null ? "none" : formatNumber(t.prior.weight, 1)) : "",
        t ? `${formatNumber(t.leakage.inSample, 3)}/${formatNumber(t.leakage.outOfFold, 3)}${forward ? `/${formatNumber(t.leakage.forward, 3)}` : ""}` : "");
    }
    row.push(c.recommendation.encoding + (c.recommendation.overridden ? " (user)" : ""), keyParams(c));
    table.push(row);
  }
  const t = profile.target;
  const header = `${formatCount(profile.input.rows)} rows, ${profile.columns.length} columns` +
    (t?.kind === "multiclass" ? `; target '${t.column}' (multiclass: ${t.classes.map((k) => `${k.value} ${formatShare(k.share)}`).join(", ")}; ${formatCount(t.missing)} missing)`
      : t ? `; target '${t.column}' (${t.kind}, mean ${formatNumber(t.mean, 4)}, ${formatCount(t.missing)} missing)` : "") +
    `; ${profile.settings.folds} folds, seed ${profile.settings.seed}` +
    (profile.settings.fold?.kind === "grouped" ? ` (grouped by ${profile.settings.fold.keyColumns.join(", ")})` : "") +
    (profile.settings.fold?.kind === "time-blocks" ? ` (time-ordered blocks by ${profile.settings.fold.timeColumn})` : "");
  return `${header}\n${table.toString()}\n`;
}
