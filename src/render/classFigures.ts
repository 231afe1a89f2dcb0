/**
 * render/classFigures: a multi-class target's figures of one column, compactly, for the Markdown
 * record and the HTML report alike (each draws the tables its own way): per class against the
 * rest (m, flagged levels, leakage AUC, the binary advice), the top levels' class rates with their
 * Wilson intervals, and the multi-class evidence (class shares against target encoding).
 */
import type { ClassFigures, ColumnProfile } from "../profile/types.js";
import { formatCount, formatNumber, formatShare } from "./format.js";

export interface FigureTable { title: string; header: string[]; rows: string[][]; note?: string }

const weightText = (w: number | null): string => (w === null ? "∞ (no spread)" : formatNumber(w, 1));

/** Per class: its prior weight, flags, leakage AUC and what the binary path advises for it. */
export function classSummaryTable(column: ColumnProfile): FigureTable | null {
  if (!column.classes || column.classes.length === 0) return null;
  return {
    title: "Per class, one against the rest",
    header: ["class", "prior weight m", "levels flagged (expected by chance)", "AUC in-sample / out-of-fold", "binary advice"],
    rows: column.classes.map((k) => [
      k.value, weightText(k.target.prior.weight), `${formatCount(k.target.flaggedLevels)} (${formatNumber(k.target.expectedFalseFlags, 1)})`,
      `${formatNumber(k.target.leakage.inSample, 3)} / ${formatNumber(k.target.leakage.outOfFold, 3)}`, k.advised,
    ]),
  };
}

/** The top levels' rate of each class, with its 95 % Wilson interval (and ▲/▼ when it excludes the class's share). */
export function classLevelsTable(column: ColumnProfile, shown: number): FigureTable | null {
  const classes = column.classes;
  if (!classes || classes.length === 0 || column.topLevels.length === 0) return null;
  const rate = (l: ClassFigures["levels"][number]) =>
    l.targetMean === undefined ? "—"
      : `${formatShare(l.targetMean)}${l.low !== undefined && l.high !== undefined ? ` [${formatShare(l.low)}–${formatShare(l.high)}]` : ""}${l.flag === "above" ? " ▲" : l.flag === "below" ? " ▼" : ""}`;
  return {
    title: `Class rates of the top levels${column.topLevels.length > shown ? ` (first ${shown} of ${column.topLevels.length})` : ""}`,
    header: ["level", "rows", ...classes.map((k) => k.value)],
    rows: column.topLevels.slice(0, shown).map((level, i) => [level.value ?? "(missing)", formatCount(level.rows), ...classes.map((k) => rate(k.levels[i] ?? {}))]),
    note: "Each class's share of the level's rows with a target, with its 95 % Wilson interval; ▲/▼: the interval lies above/below the class's overall share.",
  };
}

/** The multi-class evidence: class shares against one-vs-rest target encoding. */
export function multiclassEvidenceTable(column: ColumnProfile): FigureTable | null {
  const e = column.multiclassEvidence;
  if (!e) return null;
  const label = { "class-shares": "class shares (column unused)", "target-kfold": "target encoding, one class against the rest" };
  return {
    title: e.validation === "forward"
      ? `Forward multi-class log loss (${e.folds} steps over time blocks, ${formatCount(e.rows)} rows scored)`
      : `Out-of-fold multi-class log loss (${e.folds} folds, ${formatCount(e.rows)} rows)`,
    header: ["candidate", "log loss", "± SE", ""],
    rows: e.candidates.map((c) => [label[c.candidate], formatNumber(c.loss, 5), formatNumber(c.se, 5), c.candidate === e.chosen ? "chosen" : ""]),
    note: e.reason,
  };
}

/** All three, in order (those a column has). */
export function classTables(column: ColumnProfile, shown: number): FigureTable[] {
  return [classSummaryTable(column), classLevelsTable(column, shown), multiclassEvidenceTable(column)].filter((t): t is FigureTable => t !== null);
}

/** A multi-class target encoding's parameters in a line: each class's m, then folds and seed. */
export function classParamsText(params: object): string | null {
  const p = params as { classes?: { value: string; weight: number | null }[]; folds?: number; seed?: number };
  if (!Array.isArray(p.classes)) return null;
  return `one column per class: ${p.classes.map((c) => `${c.value} m=${c.weight === null ? "∞" : formatNumber(c.weight, 1)}`).join(", ")}; folds=${String(p.folds)}, seed=${String(p.seed)}`;
}
