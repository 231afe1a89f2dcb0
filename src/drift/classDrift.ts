/**
 * drift/classDrift: a multi-class target's class mix in a new extract against the plan's, by the
 * population stability index over the classes (stats/populationStabilityIndex): bins are the
 * plan's classes in the plan's order, plus one bin for classes the plan does not know (its plan
 * share is 0, floored at PSI's epsilon like any bin empty on one side). Bands as for a column's
 * level mix (drift/psiRule): < psiWatch ok, ≥ psiWatch watch, ≥ psiAct act. A class the plan
 * never saw is at least `watch`: the model has no output for it.
 */
import type { MulticlassTarget } from "../profile/types.js";
import { formatNumber, formatShare } from "../render/format.js";
import { populationStabilityIndex } from "../stats/populationStabilityIndex.js";
import { worse } from "./status.js";
import type { DriftClasses, DriftStatus, DriftThresholds } from "./types.js";

/** `found`: the new extract's non-missing target values (trimmed) and their rows. */
export function classDrift(target: MulticlassTarget, found: readonly { v: string; n: number }[], t: DriftThresholds): DriftClasses {
  const known = new Map(target.classes.map((c, i) => [c.value, i]));
  const counts = target.classes.map(() => 0);
  const unknown: { value: string; rows: number }[] = [];
  for (const f of found) {
    const i = known.get(f.v);
    if (i === undefined) unknown.push({ value: f.v, rows: f.n });
    else counts[i] = (counts[i] ?? 0) + f.n;
  }
  unknown.sort((a, b) => b.rows - a.rows || (a.value < b.value ? -1 : 1));
  const rows = counts.reduce((a, b) => a + b, 0) + unknown.reduce((a, u) => a + u.rows, 0);
  const unknownRows = unknown.reduce((a, u) => a + u.rows, 0);
  const classes = target.classes.map((c, i) => ({ value: c.value, planShare: c.share, rows: counts[i]!, share: rows > 0 ? counts[i]! / rows : 0 }));
  if (rows === 0) {
    return { column: target.column, rows: 0, psi: null, classes, unknown, status: "ok", reasons: [`The new extract has no value of '${target.column}': the class mix is not compared.`] };
  }
  const psi = populationStabilityIndex([...counts, unknownRows], [...target.classes.map((c) => c.rows), 0]);
  let status: DriftStatus = psi >= t.psiAct ? "act" : psi >= t.psiWatch ? "watch" : "ok";
  const mix = classes.map((c) => `${c.value} ${formatShare(c.share)} (plan ${formatShare(c.planShare)})`).join(", ");
  const reasons = [`Class mix of '${target.column}': PSI ${formatNumber(psi, 3)} over ${classes.length + 1} bins (the plan's ${classes.length} classes and one for classes it does not know): ${mix}.`];
  if (unknown.length > 0) {
    status = worse(status, "watch");
    reasons.push(`${unknown.length} class${unknown.length === 1 ? "" : "es"} the plan does not know (${formatShare(unknownRows / rows)} of the rows): ${unknown.slice(0, 5).map((u) => `'${u.value}'`).join(", ")}${unknown.length > 5 ? ", …" : ""}; the encoding has no column for ${unknown.length === 1 ? "it" : "them"}.`);
  }
  return { column: target.column, rows, psi, classes, unknown, status, reasons };
}
