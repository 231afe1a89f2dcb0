/**
 * hierarchy/hierarchyFor: the entry point scan calls after the level table and its totals exist.
 * For every categorical or identifier-like column with more levels than the one-hot width, it
 * detects nesting on a bounded sample of levels (JavaScript), then measures every candidate
 * parent and the backoff grouping over all levels (DuckDB).
 */
import { hashWidths, type AdvicePolicy } from "../advice/policy.js";
import type { Engine } from "../engine/db.js";
import type { ColumnProfile } from "../profile/types.js";
import { backoffFigures, buildBackoffMap } from "./backoff.js";
import { backoffHashing } from "./backoffHashing.js";
import { isCounterLike } from "./counter.js";
import { detectHierarchy } from "./detect.js";
import { parentFigures } from "./parentFigures.js";
import { sampleLevels } from "./sample.js";
import { shapeSupports } from "./shapeCuts.js";
import { parentSpread } from "./spread.js";
import type { HierarchyFigures, ParentFigures, ParentSpec } from "./types.js";

/** Backoff must map at least this share of rows to a level or a parent for the hierarchy to be useful. */
export const USEFUL_COVERAGE = 0.5;

/** Without a target, some proposed parent must have at least this share of rows in well-filled groups. */
export const WELL_FILLED_SHARE = 0.5;

/**
 * The parents proposed: with a target, those that explain part of the between-level spread
 * (hierarchy/spread, figures attached); without one, those the code shape supports
 * (hierarchy/shapeCuts), and only when one of them is well filled. Edge case: none → [].
 */
export async function proposedParents(engine: Engine, col: number, pattern: "fixed-length" | "delimited", shape: string, figures: readonly ParentFigures[]): Promise<ParentFigures[]> {
  const spread = await parentSpread(engine, col, figures.map((f) => f.parent));
  if (spread) return figures.flatMap((f, i) => { const s = spread[i]; return s?.groups ? [{ ...f, targetSpread: s }] : []; });
  const kept = figures.filter((f) => shapeSupports(pattern, shape, f.parent));
  return kept.some((f) => f.wellFilledRowShare >= WELL_FILLED_SHARE) ? kept : [];
}

/** The parent of the hierarchical prior: the deepest with half its rows in well-filled groups, else the shallowest. */
export function choosePriorParent(parents: readonly ParentFigures[]): ParentSpec | null {
  const filled = parents.filter((p) => p.wellFilledRowShare >= 0.5);
  return (filled[filled.length - 1] ?? parents[0])?.parent ?? null;
}

/**
 * Hierarchy figures per column index (the `col` of the level table = the index in `columns`).
 * Columns without a detected pattern, or whose parents do not group levels over the full table
 * (one group, or as many groups as levels), or with no proposed parent (proposedParents), are
 * absent from the map. Leaves BACKOFF_TABLE holding
 * the last column's mapping.
 */
export async function hierarchyFor(engine: Engine, columns: readonly ColumnProfile[], policy: AdvicePolicy): Promise<Map<number, HierarchyFigures>> {
  const out = new Map<number, HierarchyFigures>();
  const cols = columns.flatMap((c, i) => ((c.role === "categorical" || c.role === "identifier") && c.distinct > policy.maxOneHot ? [i] : []));
  const samples = await sampleLevels(engine, cols);
  for (const col of cols) {
    const column = columns[col]!;
    const levels = samples.get(col) ?? [];
    const detected = detectHierarchy(levels);
    if (!detected) continue;
    const measured = (await parentFigures(engine, col, detected.parents, policy.minLevelRows))
      .filter((f) => f.groups > 1 && f.groups < column.distinct);
    const figures = await proposedParents(engine, col, detected.pattern, detected.shape, measured);
    if (figures.length === 0) continue;
    await buildBackoffMap(engine, col, figures.map((f) => f.parent), policy.minLevelRows);
    const backoff = await backoffFigures(engine, policy.minLevelRows);
    const counterLike = detected.pattern === "fixed-length" && (await isCounterLike(engine, col, detected.shape));
    const useful = !counterLike && backoff.groups >= 2 && backoff.parentRowShare > 0 && backoff.coverage >= USEFUL_COVERAGE;
    if (useful && column.role === "identifier") {
      const hashing = await backoffHashing(engine, hashWidths(policy), policy.collisionBudget);
      if (hashing) backoff.hashing = hashing;
    }
    out.set(col, {
      pattern: detected.pattern, shape: detected.shape, sampledLevels: levels.length, matchingShare: detected.matchingShare,
      parents: figures, priorParent: choosePriorParent(figures), backoff, counterLike, useful,
    });
  }
  return out;
}
