/**
 * encode/hierarchyParams: reads the hierarchy part of a target-kfold plan column — the backoff
 * grouping (`grouping: "backoff"`, `parents` deepest first, `minRows`, `weight`) or the
 * hierarchical prior (`prior: "hierarchical"`, `parent`, `weight`, `parentWeight`), as the
 * evidence writes them (evidence/hierarchyCandidates) — into a checked TargetStructure; and the
 * backoff grouping of a hashing column (hierarchy/applyHierarchy) into a HashGrouping.
 */
import { TailsiftError } from "../errors.js";
import { DELIMITERS, type ParentSpec } from "../hierarchy/types.js";
import type { HashGrouping, TargetStructure } from "./types.js";

const bad = (column: string, what: string) => new TailsiftError("bad_plan", `plan column '${column}': ${what}; rescan or fix the plan`);

const positiveInteger = (x: unknown): x is number => typeof x === "number" && Number.isInteger(x) && x >= 1 && x <= 2 ** 31;

/** A ParentSpec as evidence writes it: {kind:"prefix",length} or {kind:"tokens",count,delimiters}. */
function parentSpec(column: string, value: unknown, name: string): ParentSpec {
  const p = (typeof value === "object" && value !== null ? value : {}) as Record<string, unknown>;
  if (p.kind === "prefix" && positiveInteger(p.length)) return { kind: "prefix", length: p.length };
  if (p.kind === "tokens" && positiveInteger(p.count) && typeof p.delimiters === "string" && p.delimiters !== ""
    && [...p.delimiters].every((ch) => DELIMITERS.includes(ch))) {
    return { kind: "tokens", count: p.count, delimiters: p.delimiters };
  }
  throw bad(column, `params.${name} must be {"kind":"prefix","length":n} or {"kind":"tokens","count":n,"delimiters":"…"} (delimiters among '${DELIMITERS}')`);
}

/** A prior weight: a number ≥ 0, or null (infinite: the group takes its prior). */
function weight(column: string, value: unknown, name: string): number | null {
  if (value === null) return null;
  if (typeof value === "number" && Number.isFinite(value) && value >= 0) return value;
  throw bad(column, `params.${name} must be a number ≥ 0 or null (no detectable spread: the prior)`);
}

/**
 * The backoff grouping of a plan column (`grouping: "backoff"`, target-kfold or hashing):
 * `parents` given deepest first (as in the plan), returned shallowest first, and `minRows`.
 * With `allowPooling` (target-kfold) an empty parents list pools: levels with fewer than minRows
 * rows share "other" (the pooled target encoding of identifier-like columns). Edge cases: an
 * empty parents list otherwise, a malformed parent, minRows not a number ≥ 0 → `bad_plan`.
 */
export function backoffGrouping(column: string, params: Record<string, unknown>, allowPooling = false): HashGrouping {
  const parents = params.parents;
  // target-kfold only: an empty list is pooling — a level with ≥ minRows rows keeps its group, rarer ones share "other"
  if (allowPooling && Array.isArray(parents) && parents.length === 0) return { kind: "backoff", parents: [], minRows: minRowsOf(column, params) };
  if (!Array.isArray(parents) || parents.length === 0) throw bad(column, "params.parents must be a non-empty list of parents, deepest first");
  const minRows = minRowsOf(column, params);
  const specs = parents.map((p, i) => parentSpec(column, p, `parents[${i}]`));
  return { kind: "backoff", parents: specs.reverse(), minRows };
}

function minRowsOf(column: string, params: Record<string, unknown>): number {
  const minRows = params.minRows;
  if (typeof minRows !== "number" || !Number.isFinite(minRows) || minRows < 0) throw bad(column, "params.minRows must be a number ≥ 0");
  return minRows;
}

/**
 * The grouping of a hashing column: undefined (plain hashing) or the backoff grouping.
 * @throws TailsiftError `bad_plan` for another grouping or a malformed backoff grouping.
 */
export function hashingGrouping(column: string, params: Record<string, unknown>): HashGrouping | undefined {
  if (params.grouping === undefined) return undefined;
  if (params.grouping !== "backoff") throw bad(column, `unknown params.grouping '${String(params.grouping)}' (only "backoff")`);
  return backoffGrouping(column, params);
}

/**
 * The structure of a target-kfold column, or undefined for flat target encoding. Backoff
 * `parents` are given deepest first (as in the plan) and returned shallowest first.
 * Edge cases: an empty parents list, both a grouping and a hierarchical prior, an unknown
 * grouping or prior kind → TailsiftError `bad_plan`.
 */
export function targetStructure(column: string, params: Record<string, unknown>): TargetStructure | undefined {
  const { grouping, prior } = params;
  if (grouping === undefined && prior === undefined) return undefined;
  if (grouping !== undefined && prior !== undefined) throw bad(column, "params has both a grouping and a prior; give one");
  if (grouping === "backoff") return { ...backoffGrouping(column, params, true), weight: weight(column, params.weight, "weight") };
  if (prior === "hierarchical") {
    return {
      kind: "hierarchical", parent: parentSpec(column, params.parent, "parent"),
      weight: weight(column, params.weight, "weight"), parentWeight: weight(column, params.parentWeight, "parentWeight"),
    };
  }
  throw bad(column, grouping !== undefined ? `unknown params.grouping '${String(grouping)}' (only "backoff")` : `unknown params.prior '${String(prior)}' (only "hierarchical")`);
}
