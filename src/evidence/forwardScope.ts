/**
 * evidence/forwardScope: the scope of one forward step (evidence/forward): while a step b runs,
 * the evidence's level-table reads keep the folds ≤ b (forwardFoldFilter, appended by
 * evidence/baseSql and the weight fits) and scorePredictions hands its per-fold sums back
 * (recordFoldSums). Outside a step both do nothing, so k-fold scoring is unchanged.
 */
import { AsyncLocalStorage } from "node:async_hooks";
import { sqlNumber } from "../engine/sql.js";
import type { FoldSums } from "./foldLoss.js";

export interface ForwardStep { upTo: number; sums?: FoldSums[] }
const scope = new AsyncLocalStorage<ForwardStep>();

/**
 * Within a forward step: ` AND <alias.>fold <= b` to append to a level-table WHERE (the scored
 * block and its past), or with `pastOnly` ` < b` (a fit that must not see the scored block); else "".
 */
export function forwardFoldFilter(alias?: string, pastOnly = false): string {
  const step = scope.getStore();
  return step ? ` AND ${alias ? `${alias}.` : ""}fold ${pastOnly ? "<" : "<="} ${sqlNumber(step.upTo)}` : "";
}

/** True inside a forward step: shortcuts that read every fold (batched or shared k-fold scores) must not be used. */
export function inForwardStep(): boolean {
  return scope.getStore() !== undefined;
}

/** Called by scorePredictions with its per-fold sums: a forward step keeps them. */
export function recordFoldSums(folds: readonly FoldSums[]): void {
  const step = scope.getStore();
  if (step) step.sums = [...folds];
}

/** Runs `fn` as forward step `step` (folds ≤ step.upTo). */
export function runForwardStep<T>(step: ForwardStep, fn: () => Promise<T>): Promise<T> {
  return scope.run(step, fn);
}
