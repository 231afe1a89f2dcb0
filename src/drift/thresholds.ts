/**
 * drift/thresholds: the defaults behind a drift status and their validation.
 *
 * - PSI bands 0.10 / 0.25: common practice; Yurdakul & Naranjo (Journal of Risk Model
 *   Validation) note they are a rule of thumb with no error-rate basis.
 * - Unseen levels: a share whose Wilson lower bound lies above the forecast's upper bound is
 *   `watch`; at least `unseenActRatio` (3) times the forecast and above `unseenActMin` (1 %
 *   absolute, so a tiny forecast does not turn a few stray rows into `act`) is `act` (our choice).
 * - Target shift: Cohen's effect size of 0.5 ("medium"; Cohen 1988, Statistical Power Analysis
 *   for the Behavioral Sciences, 2nd ed., chs. 2 and 6 — a published convention, not a test)
 *   turns a level whose intervals separate from `watch` into `act` (our choice).
 */
import { TailsiftError } from "../errors.js";
import type { DriftThresholds } from "./types.js";

export const DEFAULT_THRESHOLDS: DriftThresholds = {
  psiWatch: 0.1,
  psiAct: 0.25,
  unseenActRatio: 3,
  unseenActMin: 0.01,
  effectAct: 0.5,
};

/** Merges user thresholds over the defaults; a TailsiftError (exit 2) names a bad value. */
export function resolveThresholds(given: Partial<DriftThresholds> = {}): DriftThresholds {
  const t: DriftThresholds = { ...DEFAULT_THRESHOLDS };
  for (const [key, value] of Object.entries(given) as [keyof DriftThresholds, number | undefined][]) {
    if (value !== undefined) t[key] = value;
  }
  const bad = (what: string) => { throw new TailsiftError("bad_option", what); };
  if (!(t.psiWatch > 0 && Number.isFinite(t.psiWatch))) bad(`--psi-watch must be a positive number (got ${t.psiWatch})`);
  if (!(t.psiAct >= t.psiWatch && Number.isFinite(t.psiAct))) bad(`--psi-act must be at least --psi-watch ${t.psiWatch} (got ${t.psiAct})`);
  if (!(t.unseenActRatio >= 1 && Number.isFinite(t.unseenActRatio))) bad(`--unseen-act-ratio must be at least 1 (got ${t.unseenActRatio})`);
  if (!(t.unseenActMin >= 0 && t.unseenActMin < 1)) bad(`--unseen-act-min must be in [0, 1) (got ${t.unseenActMin})`);
  if (!(t.effectAct > 0 && Number.isFinite(t.effectAct))) bad(`--effect-act must be a positive number (got ${t.effectAct})`);
  return t;
}
