/**
 * hierarchy/detect: from a bounded sample of a column's levels, decides whether the levels nest
 * and lists the candidate parents. A pattern counts only when its parents actually group levels:
 * some parent must have at most half as many distinct values as there are sampled levels, and
 * parents with a single value in the sample (a constant prefix such as "INV-") are left out.
 */
import { detectDelimited } from "./delimited.js";
import { detectFixedLength } from "./fixedLength.js";
import { parentOf } from "./parent.js";
import { MAX_PARENTS, type ParentSpec } from "./types.js";

export interface DetectedHierarchy {
  pattern: "fixed-length" | "delimited";
  shape: string;
  matchingShare: number;
  /** Shallowest first. */
  parents: ParentSpec[];
}

function grouping(levels: readonly string[], specs: ParentSpec[]): ParentSpec[] {
  const distinct = specs.map((s) => new Set(levels.map((l) => parentOf(s, l))).size);
  if (!distinct.some((d) => d <= 0.5 * levels.length)) return [];
  return specs.filter((_, i) => (distinct[i] ?? 0) > 1 && (distinct[i] ?? 0) < levels.length);
}

/**
 * Detects fixed-length codes first, then delimited composite keys. Edge cases: an empty or tiny
 * sample (< 10 levels), free text, or a pattern whose parents do not group → null.
 */
export function detectHierarchy(levels: readonly string[]): DetectedHierarchy | null {
  const fixed = detectFixedLength(levels);
  if (fixed) {
    const specs: ParentSpec[] = Array.from({ length: Math.min(fixed.length - 1, MAX_PARENTS) }, (_, i) => ({ kind: "prefix", length: i + 1 }));
    const parents = grouping(levels, specs);
    return parents.length > 0 ? { pattern: "fixed-length", shape: fixed.shape, matchingShare: fixed.matchingShare, parents } : null;
  }
  const delimited = detectDelimited(levels);
  if (delimited) {
    const specs: ParentSpec[] = Array.from({ length: Math.min(delimited.tokens - 1, MAX_PARENTS) },
      (_, i) => ({ kind: "tokens", count: i + 1, delimiters: delimited.delimiters }));
    const parents = grouping(levels, specs);
    return parents.length > 0 ? { pattern: "delimited", shape: delimited.signature, matchingShare: delimited.matchingShare, parents } : null;
  }
  return null;
}
