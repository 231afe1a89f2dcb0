/**
 * drift/targetRule: verdicts on target shifts. A top level whose plan and new intervals
 * (simultaneous 95 % over the column's top levels) do not overlap → watch; when its effect size (Cohen's h or d) is also at least effectAct (0.5,
 * Cohen's "medium") → act, because a target encoding fitted on the plan now misstates that level
 * by a margin that matters (our choice). A level whose new interval merely excludes the plan's
 * point rate is counted (`flagged`) but does not set the status: the plan's rate is itself an
 * estimate, so that happens by chance far more often than 5 % of the time.
 * The overall rate shifting (intervals apart) is at most watch: it moves the prior of every
 * encoding, and the per-level checks say whether individual encodings moved.
 */
import { formatCompact, formatNumber } from "../render/format.js";
import type { TargetKind } from "../profile/types.js";
import type { ColumnTargetShift, DriftThresholds, RateShift, Verdict } from "./types.js";

const SHOWN = 3;

function rateText(r: number | null, i: { low: number; high: number } | null): string {
  return `${formatNumber(r, 3)}${i ? ` (${formatNumber(i.low, 3)}–${formatNumber(i.high, 3)})` : ""}`;
}

function effectName(kind: TargetKind): string {
  return kind === "binary" ? "Cohen's h" : "Cohen's d";
}

function shiftText(s: RateShift): string {
  return `${rateText(s.rate, s.interval)} vs plan ${rateText(s.planRate, s.planInterval)}`;
}

/** The column's verdict on its top levels' target rates. Edge case: no tested level → ok. */
export function levelShiftVerdict(shift: ColumnTargetShift, target: string, kind: TargetKind, t: DriftThresholds): Verdict {
  const what = kind === "binary" ? `'${target}' rate` : `'${target}' mean`;
  const separated = shift.levels.filter((l) => l.separated)
    .sort((a, b) => Math.abs(b.effect ?? 0) - Math.abs(a.effect ?? 0) || a.value.localeCompare(b.value));
  if (shift.tested === 0) {
    return { status: "ok", reason: `Target ${what}: none of the plan's top levels has target values in both extracts; not compared.` };
  }
  const level = `simultaneous 95 % over ${shift.tested} level${shift.tested === 1 ? "" : "s"}, each at ${formatCompact(shift.confidence * 100, 4)} %`;
  if (separated.length === 0) {
    return { status: "ok", reason: `Target ${what}: no top level's interval separates from the plan's (${level}; ${shift.flagged} exclude the plan's point rate).` };
  }
  const large = separated.filter((l) => l.effect !== null && Math.abs(l.effect) >= t.effectAct);
  const list = separated.slice(0, SHOWN)
    .map((l) => `'${l.value}' ${shiftText(l)}, ${effectName(kind)} ${formatNumber(l.effect, 2)}`).join("; ");
  const more = separated.length > SHOWN ? `; and ${separated.length - SHOWN} more` : "";
  const head = `Target ${what} moved on ${separated.length} of ${shift.tested} top levels (intervals apart, ${level}): ${list}${more}`;
  const actAt = `act at |${effectName(kind)}| ≥ ${formatCompact(t.effectAct)}`;
  return large.length > 0
    ? { status: "act", reason: `${head} (${actAt}; ${large.length} level${large.length === 1 ? "" : "s"} reach it).` }
    : { status: "watch", reason: `${head} (${actAt}).` };
}

/** The verdict on the overall target rate or mean: separated → watch, else ok. */
export function overallTargetVerdict(shift: RateShift, target: string, kind: TargetKind): Verdict {
  const what = kind === "binary" ? `'${target}' rate` : `'${target}' mean`;
  const body = `Overall ${what} ${shiftText(shift)}, ${effectName(kind)} ${formatNumber(shift.effect, 2)}`;
  return shift.separated
    ? { status: "watch", reason: `${body}: the 95 % intervals do not overlap (at most watch: the prior of every target encoding moved).` }
    : { status: "ok", reason: `${body}: the 95 % intervals overlap.` };
}
