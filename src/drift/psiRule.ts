/**
 * drift/psiRule: the population stability index of a column's level mix, over the plan's top
 * levels plus one bin for all other non-missing levels (including levels the plan never saw) and
 * one for missing. Expected shares come from the plan, actual shares from the new extract.
 * Bands: < psiWatch ok, ≥ psiWatch watch, ≥ psiAct act (0.10 / 0.25 by default: a rule of thumb,
 * common practice — Yurdakul & Naranjo call it one).
 */
import { formatCompact, formatNumber } from "../render/format.js";
import { populationStabilityIndex } from "../stats/populationStabilityIndex.js";
import type { DriftThresholds, Verdict } from "./types.js";

export interface PsiBins {
  /** Rows per plan top level, in the plan and in the new extract (same order). */
  planTop: readonly number[];
  newTop: readonly number[];
  planRest: number;
  newRest: number;
  planMissing: number;
  newMissing: number;
}

export interface PsiCheck { psi: number | null; bins: number; verdict: Verdict }

/**
 * Bins empty on both sides carry no information and are left out (so a column without missing
 * values is not charged the epsilon floor of an empty missing bin). A bin empty on one side only
 * is floored at populationStabilityIndex's epsilon (1e-4).
 * Edge cases: no rows on one side, or fewer than two bins with rows → psi null (nothing to compare), ok.
 */
export function psiCheck(b: PsiBins, t: DriftThresholds): PsiCheck {
  const expected = [...b.planTop, b.planRest, b.planMissing];
  const actual = [...b.newTop, b.newRest, b.newMissing];
  const keep = expected.map((e, i) => e > 0 || (actual[i] ?? 0) > 0);
  const e = expected.filter((_, i) => keep[i]);
  const a = actual.filter((_, i) => keep[i]);
  const sum = (xs: number[]) => xs.reduce((s, x) => s + x, 0);
  if (e.length < 2 || sum(e) === 0 || sum(a) === 0) {
    return { psi: null, bins: e.length, verdict: { status: "ok", reason: "Fewer than two bins with rows: PSI not computed." } };
  }
  const psi = populationStabilityIndex(a, e);
  const what = `PSI ${formatNumber(psi, 3)} over ${e.length} bins (the plan's top ${b.planTop.length} levels, the rest, missing)`;
  const bands = `bands ${formatCompact(t.psiWatch)} / ${formatCompact(t.psiAct)}, a rule of thumb`;
  if (psi >= t.psiAct) return { psi, bins: e.length, verdict: { status: "act", reason: `${what} is at or above ${formatCompact(t.psiAct)}: the level mix changed a lot (${bands}).` } };
  if (psi >= t.psiWatch) return { psi, bins: e.length, verdict: { status: "watch", reason: `${what} is at or above ${formatCompact(t.psiWatch)}: the level mix moved (${bands}).` } };
  return { psi, bins: e.length, verdict: { status: "ok", reason: `${what} is below ${formatCompact(t.psiWatch)}.` } };
}
