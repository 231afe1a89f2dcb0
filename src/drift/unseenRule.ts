/**
 * drift/unseenRule: rows of the new extract whose level the plan never saw, against the plan's
 * Good-Turing forecast n₁/N (Good 1953). The new sample has binomial noise of its own, so the
 * observed share gets a Wilson 95 % interval (Wilson 1927) and is called "well above" the
 * forecast only when that interval's lower bound exceeds the forecast interval's upper bound.
 * Well above → watch; also ≥ unseenActRatio × forecast and > unseenActMin absolute → act.
 * Identifier columns bring new values by nature: for them the comparison is reported, never raised.
 */
import { formatCompact, formatCount, formatShare } from "../render/format.js";
import { wilsonInterval } from "../stats/wilsonInterval.js";
import type { DriftThresholds, Interval, Verdict } from "./types.js";

export interface UnseenCheck {
  share: number | null;
  interval: Interval | null;
  verdict: Verdict;
}

const range = (i: Interval) => `${formatShare(i.low, 2)}–${formatShare(i.high, 2)}`;

/**
 * @param unseenRows rows whose non-missing level is not in the plan
 * @param nonMissing non-missing rows of the column in the new extract
 * @param forecast the plan's Good-Turing rate; null when the plan column had no non-missing rows
 *   (then every level is new and the forecast is taken as 0)
 * @param forecastInterval the plan's interval for it; when absent, the point forecast itself
 * @param identifier true for a column the plan classed as an identifier (never raised)
 * Edge cases: no non-missing rows → share null, ok (the missing share is PSI's business).
 */
export function unseenCheck(
  unseenRows: number, nonMissing: number, forecast: number | null,
  forecastInterval: Interval | null, t: DriftThresholds, identifier = false,
): UnseenCheck {
  if (nonMissing === 0) {
    return { share: null, interval: null, verdict: { status: "ok", reason: "No non-missing rows in the new extract: unseen levels not measured." } };
  }
  const share = unseenRows / nonMissing;
  const wilson = wilsonInterval(unseenRows, nonMissing);
  const interval = wilson ? { low: wilson.low, high: wilson.high } : null;
  const rate = forecast ?? 0;
  const band = forecastInterval ?? { low: rate, high: rate };
  const observed = `Unseen levels on ${formatShare(share, 2)} of non-missing rows (${formatCount(unseenRows)} rows; 95 % ${interval ? range(interval) : "n/a"})`;
  const expected = `the plan's Good-Turing forecast ${formatShare(rate, 2)} (95 % ${range(band)})`;
  const wellAbove = interval !== null && interval.low > band.high;
  if (unseenRows === 0) {
    return { share, interval, verdict: { status: "ok", reason: `No row has a level the plan never saw (${expected}).` } };
  }
  if (!wellAbove) {
    return { share, interval, verdict: { status: "ok", reason: `${observed} agree with or fall below ${expected}.` } };
  }
  if (identifier) {
    return { share, interval, verdict: { status: "ok", reason: `${observed}: above ${expected}; an identifier brings new values by nature, so this sets no status.` } };
  }
  const ratio = rate > 0 ? share / rate : Infinity;
  const times = Number.isFinite(ratio) ? `${formatCompact(ratio, 3)}×` : "infinitely many times";
  if (share >= t.unseenActRatio * rate && share > t.unseenActMin) {
    return { share, interval, verdict: { status: "act", reason:
      `${observed}: well above ${expected}, ${times} the forecast (act at ≥ ${formatCompact(t.unseenActRatio)}× and above ${formatShare(t.unseenActMin)}).` } };
  }
  return { share, interval, verdict: { status: "watch", reason:
    `${observed}: well above ${expected} (${times} the forecast; act at ≥ ${formatCompact(t.unseenActRatio)}× and above ${formatShare(t.unseenActMin)}).` } };
}
