/**
 * hierarchy/shapeCuts: without a target, which parents the code shape supports. A prefix cut is
 * proposed only where the shape says the code has parts:
 *  - at a class boundary (letter → digit or digit → letter): "B3" is grade B, step 3; "AB12" is
 *    area AB, district 12;
 *  - inside a run of digits: decimal codes are commonly allocated in nested number ranges
 *    (postcodes, numbering plans), so 941xx lies inside 94xxx (common practice);
 *  - never inside a run of letters: letter codes are read whole (abbreviations such as region
 *    codes "CA", "CO", "CT"), and their first letter groups by spelling, not by meaning.
 * Token parents of delimited keys always cut at a delimiter, so the shape supports them.
 * With a target the data decide instead (hierarchy/spread).
 */
import type { ParentSpec } from "./types.js";

/** `shape` is the fixed-length class string (D digit, L letter); delimited shapes allow every token parent. */
export function shapeSupports(pattern: "fixed-length" | "delimited", shape: string, parent: ParentSpec): boolean {
  if (pattern === "delimited" || parent.kind === "tokens") return true;
  const before = shape.charAt(parent.length - 1);
  const after = shape.charAt(parent.length);
  if (before === "" || after === "") return false;
  return before !== after || before === "D";
}
