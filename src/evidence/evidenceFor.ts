/**
 * evidence/evidenceFor: the entry point scan calls after the rules have recommended. For each
 * column with a target whose recommendation is target-kfold, frequency or pooled-one-hot (or an
 * identifier-like column: with a useful hierarchy the hierarchy candidates, else pooled target
 * encoding), scores every applicable candidate out-of-fold from the level table and applies the
 * one-standard-error rule, then the practical margin (evidence/margin, policy.minGain). The
 * overall mean is scored for all columns in one set of statements; the flat target encoding is
 * taken from the leakage statement's out-of-fold scores when given (`sharedFlat`).
 */
import type { AdvicePolicy } from "../advice/policy.js";
import type { Engine } from "../engine/db.js";
import type { FlatOofScores } from "../engine/leakage.js";
import { isTailsiftError } from "../errors.js";
import type { HierarchyFigures } from "../hierarchy/types.js";
import type { ColumnProfile, Encoding, ProfileTarget } from "../profile/types.js";
import { flatCandidate, overallMeanCandidate, overallMeanCandidates, pooledCandidate } from "./candidates.js";
import { backoffCandidate, hierarchicalCandidate } from "./hierarchyCandidates.js";
import { applyMargin } from "./margin.js";
import { chooseByOneSeRule } from "./oneSe.js";
import { pooledTargetCandidate } from "./pooledTarget.js";
import { forwardCandidates, forwardReasonPrefix, type TaggedBuilder } from "./forward.js";
import { inForwardStep } from "./forwardScope.js";
import type { Evidence, EvidenceCandidate } from "./types.js";

/** Rule outcomes that evidence may revise; the others (drop, indicator, one-hot, hashing, codes) stand. */
export const REVISABLE: readonly Encoding[] = ["target-kfold", "frequency", "pooled-one-hot"];

/** Does evidence apply to this column? Never to a user override or a column without target figures. */
export function evidenceApplies(column: ColumnProfile, hierarchy: HierarchyFigures | undefined): boolean {
  if (!column.target || column.recommendation.overridden) return false;
  // an identifier-like column is scored too: its repeated levels may carry signal (pooled target encoding)
  if (column.role === "identifier") return hierarchy?.useful === true || column.recommendation.encoding === "drop";
  return column.role === "categorical" && REVISABLE.includes(column.recommendation.encoding);
}

/**
 * Evidence per column index (= `col` in the level table). Call after recommend(): applicability
 * reads the rules' recommendation. Hierarchy candidates are scored only for hierarchies that are
 * not counter-like. Edge case: a column whose candidates all fail to score is absent.
 */
export async function evidenceFor(
  engine: Engine, columns: readonly ColumnProfile[], target: ProfileTarget, policy: AdvicePolicy,
  hierarchy: ReadonlyMap<number, HierarchyFigures>, skipped?: Set<number>, sharedFlat?: FlatOofScores,
): Promise<Map<number, Evidence>> {
  const out = new Map<number, Evidence>();
  const kind = target.kind;
  const metric = kind === "binary" ? "log-loss" : "squared-error";
  const applies = [...columns.entries()].filter(([col, column]) => evidenceApplies(column, hierarchy.get(col))).map(([col]) => col);
  // the overall mean of every column in one set of statements; column by column if that runs out of memory
  const overall = await overallMeanCandidates(engine, applies, kind).catch((err: unknown) => {
    if (isTailsiftError(err) && err.code === "out_of_memory") return null;
    throw err;
  });
  for (const col of applies) {
    const column = columns[col]!;
    const h = hierarchy.get(col);
    const built: (EvidenceCandidate | null)[] = [];
    // the k-fold builds reuse the batched overall mean and the leakage's flat scores; a forward
    // step (evidence/forwardScope) restricts the folds, so it always runs the candidate's own SQL
    const builders: TaggedBuilder[] = [{
      build: () => overall && !inForwardStep() ? Promise.resolve(overall.get(col) ?? null) : overallMeanCandidate(engine, col, kind),
    }];
    const pooledOnly = column.role === "identifier" && !(h?.useful === true && !h.counterLike);
    if (pooledOnly) {
      // identifier without a usable hierarchy: the repeated levels against the column unused
      builders.push({ build: () => pooledTargetCandidate(engine, col, column, kind, policy) });
    } else {
      builders.push({ build: () => pooledCandidate(engine, col, column, kind, policy) });
      builders.push({ flat: true, build: () => flatCandidate(engine, col, column, kind, policy, inForwardStep() ? undefined : sharedFlat) });
    }
    if (h && !h.counterLike && !pooledOnly) {
      builders.push({ build: () => backoffCandidate(engine, col, column, h, kind, policy) });
      builders.push({ build: () => hierarchicalCandidate(engine, col, column, h, kind, policy) });
    }
    let forward: Awaited<ReturnType<typeof forwardCandidates>> | undefined;
    try {
      for (const b of builders) built.push(await b.build());
      // time-ordered blocks: the same candidates scored forward decide (evidence/forward)
      if (policy.forward) forward = await forwardCandidates(engine, col, column, kind, policy, builders);
    } catch (err) {
      // a tight --memory-limit: this column's evidence is skipped (the caller says so), the scan goes on
      if (!(isTailsiftError(err) && err.code === "out_of_memory")) throw err;
      skipped?.add(col);
      continue;
    }
    const kfold = built.filter((c): c is EvidenceCandidate => c !== null);
    const candidates = forward ? forward.candidates : kfold;
    // an identifier with no level reaching minLevelRows has nothing to pool: no comparison to show
    if (candidates.length < 2 && column.role === "identifier") continue;
    const oneSe = chooseByOneSeRule({ candidates, metric });
    const choice = oneSe && applyMargin(oneSe, { candidates, metric }, policy.minGain);
    if (!choice) continue;
    out.set(col, {
      metric, folds: policy.folds, rows: target.rows, candidates,
      best: choice.best.candidate, chosen: choice.candidate.candidate, rule: "one-standard-error", threshold: choice.threshold,
      reason: forward ? forwardReasonPrefix(policy.folds) + choice.reason.replaceAll("out-of-fold", "forward") : choice.reason,
      ...(forward ? { validation: "forward" as const, kfold, ...(forward.weight ? { forwardWeight: forward.weight } : {}) } : {}),
    });
  }
  return out;
}
