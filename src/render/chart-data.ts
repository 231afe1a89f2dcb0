/**
 * The numbers behind the report's charts, kept apart from the chart specs so they can be tested
 * as plain computations: coverage curves, funnel-plot limits, log-spaced sample grids and the
 * evidence chart's loss intervals.
 * Every function here is bounded: it never returns more points than asked for.
 */
import type { CandidateName, Evidence } from "../evidence/types.js";
import type { ColumnProfile } from "../profile/types.js";
import { funnelHalfWidth as statsFunnelHalfWidth, funnelLimits } from "../stats/funnelLimits.js";

/** z for a two-sided 95 % limit (normal quantile 0.975). */
export const Z_95 = 1.959964;
/** z for a two-sided 99.8 % limit (normal quantile 0.999), as in Spiegelhalter (2005). */
export const Z_998 = 3.090232;

/**
 * At most `count` distinct integers from `min` to `max`, evenly spaced on a log scale, always
 * including both ends. min > max, or a non-finite or non-positive bound → empty list.
 */
export function logGrid(min: number, max: number, count: number): number[] {
  const lo = Math.ceil(min);
  const hi = Math.floor(max);
  if (!Number.isFinite(lo) || !Number.isFinite(hi) || lo < 1 || hi < lo || count < 1) return [];
  if (hi - lo + 1 <= count) return Array.from({ length: hi - lo + 1 }, (_, i) => lo + i);
  const steps = Math.max(1, count - 1);
  const ratio = Math.log(hi / lo) / steps;
  const out = new Set<number>([lo, hi]);
  for (let i = 1; i < steps; i += 1) out.add(Math.round(lo * Math.exp(ratio * i)));
  return [...out].sort((a, b) => a - b);
}

/** A point of a coverage curve: the top `rank` levels hold `share` of the non-missing rows. */
export interface CoveragePoint {
  rank: number;
  share: number;
}

/**
 * The coverage curve of a column: the share of non-missing rows held by its `rank` most frequent
 * levels, for ranks on a log grid (at most `maxPoints` points). Exact from the count-of-counts
 * (levels sorted by count, descending; the curve is linear in rank within one count), otherwise
 * the profile's coverage entries plus (distinct, 1). No levels or no rows → empty list.
 */
export function coveragePoints(column: ColumnProfile, maxPoints = 200): CoveragePoint[] {
  const groups = (column.countOfCounts ?? [])
    .filter((g) => g.count > 0 && g.levels > 0)
    .sort((a, b) => b.count - a.count);
  if (groups.length === 0) return coverageFromEntries(column);
  const total = groups.reduce((sum, g) => sum + g.count * g.levels, 0);
  const distinct = groups.reduce((sum, g) => sum + g.levels, 0);
  const points: CoveragePoint[] = [];
  let group = 0;
  let ranksBefore = 0;
  let rowsBefore = 0;
  for (const rank of logGrid(1, distinct, maxPoints)) {
    let current = groups[group];
    while (current !== undefined && rank > ranksBefore + current.levels) {
      ranksBefore += current.levels;
      rowsBefore += current.levels * current.count;
      group += 1;
      current = groups[group];
    }
    if (current === undefined) break;
    points.push({ rank, share: (rowsBefore + (rank - ranksBefore) * current.count) / total });
  }
  return points;
}

function coverageFromEntries(column: ColumnProfile): CoveragePoint[] {
  const points = column.coverage
    .filter((c) => c.levels >= 1 && Number.isFinite(c.share))
    .map((c) => ({ rank: c.levels, share: c.share }));
  const last = points.reduce((max, p) => Math.max(max, p.rank), 0);
  if (points.length > 0 && column.distinct >= last) points.push({ rank: column.distinct, share: 1 });
  return points.sort((a, b) => a.rank - b.rank || a.share - b.share);
}

/**
 * Half-width of a funnel-plot control limit at n rows around the overall rate p0 — the formula is
 * stats/funnelLimits (Spiegelhalter 2005); this only adds the chart's policy: n < 1 → null (no
 * limit at zero rows).
 */
export function funnelHalfWidth(p0: number, n: number, z: number, sd?: number): number | null {
  if (!(n >= 1)) return null;
  return statsFunnelHalfWidth(p0, n, z, sd);
}

/** One point of a funnel limit: the lower and upper limit at n rows. */
export interface FunnelLimitPoint {
  n: number;
  low: number;
  high: number;
}

/**
 * Funnel-plot control limits (stats/funnelLimits: p0 ± z·√(p0(1−p0)/n), or p0 ± z·sd/√n with
 * `sd`; proportions clamped to [0, 1]) at about 80 row counts from nMin to nMax on a log grid,
 * ends included. nMax < nMin or nMax < 1 → empty list.
 */
export function funnelLimitPoints(p0: number, nMin: number, nMax: number, z: number, sd?: number): FunnelLimitPoint[] {
  return logGrid(Math.max(1, nMin), nMax, 80).map((n) => ({ n, ...funnelLimits(p0, n, z, sd) }));
}

/** A candidate on the evidence chart: its out-of-fold loss and the ±1 SE interval (null without an SE). */
export interface EvidencePoint {
  candidate: CandidateName;
  loss: number;
  low: number | null;
  high: number | null;
}

/**
 * The evidence chart's points, in the evidence's order (simplest first): loss, loss − SE and
 * loss + SE. A candidate without a finite loss is left out; one without a finite standard error
 * (fewer than two folds) keeps its point with no interval.
 */
export function evidencePoints(evidence: Evidence): EvidencePoint[] {
  return evidence.candidates.filter((c) => Number.isFinite(c.loss)).map((c) => {
    const se = c.se !== null && Number.isFinite(c.se) ? c.se : null;
    return { candidate: c.candidate, loss: c.loss, low: se === null ? null : c.loss - se, high: se === null ? null : c.loss + se };
  });
}

/**
 * Splits a label into lines of at most `width` characters at spaces, greedily; a word longer than
 * `width` gets a line of its own (never cut). The empty string → [""].
 */
export function wrapLabel(text: string, width: number): string[] {
  const lines: string[] = [];
  for (const word of text.split(" ")) {
    const last = lines.length - 1;
    if (last >= 0 && `${lines[last]} ${word}`.length <= width) lines[last] = `${lines[last]} ${word}`;
    else lines.push(word);
  }
  return lines;
}
