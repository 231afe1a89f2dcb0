/**
 * evidence/forward: forward (rolling-origin) scoring of the evidence candidates when the folds
 * are time-ordered blocks (fold kind time-blocks, --time): for each step b = 1..K−1 the candidate
 * is fitted on blocks < b and scores block b; its forward loss is the mean of the K − 1 step
 * losses with the standard error s/√(K − 1) (stats/stepMean; rolling-origin evaluation, Tashman
 * 2000, docs/references.md).
 *
 * How a step is scored with the candidates' own SQL, unchanged: a candidate's out-of-fold
 * prediction for fold f is fitted on "every fold but f". Restricted to the folds ≤ b, "every fold
 * but b" is exactly the blocks < b. So a step runs the candidate's builder with the level table's
 * folds restricted to ≤ b (forwardFoldFilter, read by evidence/baseSql and the weight fits) and
 * keeps fold b's loss (recordFoldSums, called by evidence/scoreSql). The restriction is a scope
 * (AsyncLocalStorage) around one builder call, so no candidate's signature changes.
 *
 * The backoff groups' weight m is fitted on blocks < b only (forwardFoldFilter pastOnly); the
 * hierarchical prior's weights are fitted per fold on the other folds, i.e. on blocks < b too.
 * Not restricted (stated in the README "--time"): which levels pooled one-hot keeps and which
 * levels a backoff grouping pools are chosen from the row counts of all blocks (never the
 * target), as the k-fold evidence does. The forward step has no AUC or R² (the pooled scores of
 * a step mix its fitting blocks): forward candidates carry the loss only.
 *
 * The flat candidate's prior weight is chosen for forward loss: the fitted m (beta-binomial or
 * normal–normal moments) times each factor of WEIGHT_FACTORS, and m = ∞, are scored forward and
 * the lowest forward loss wins (ties to the fitted m). The winner's loss is measured on the same
 * steps it was chosen on, so it is slightly optimistic; the record keeps the fitted m's loss too.
 */
import type { AdvicePolicy } from "../advice/policy.js";
import type { Engine } from "../engine/db.js";
import type { ColumnProfile, TargetKind } from "../profile/types.js";
import type { ForwardWeight } from "../profile/evidenceTypes.js";
import type { Recommendation } from "../profile/types.js";
import type { PriorWeight } from "../profile/recommendation.js";
import { stepMean } from "../stats/stepMean.js";
import { flatCandidate } from "./candidates.js";
import { runForwardStep, type ForwardStep } from "./forwardScope.js";
import { fmt, label } from "./oneSe.js";
import type { Evidence, EvidenceCandidate } from "./types.js";

/** A candidate builder (one of evidenceFor's). */
export type CandidateBuilder = () => Promise<EvidenceCandidate | null>;

/**
 * The forward score of one builder over K time blocks: steps b = 1..K−1, each the builder run on
 * blocks ≤ b, keeping block b's loss per row. Steps where the builder gives nothing or block b
 * has no rows with a target are left out. Null when no step scores.
 */
export async function scoreForward(k: number, build: CandidateBuilder): Promise<EvidenceCandidate | null> {
  const losses: number[] = [];
  let last: EvidenceCandidate | null = null;
  for (let b = 1; b < k; b += 1) {
    const step: ForwardStep = { upTo: b };
    const c = await runForwardStep(step, build);
    const sums = step.sums?.find((f) => f.fold === b);
    if (!c || !sums || sums.rows <= 0) continue;
    losses.push(sums.loss / sums.rows);
    last = c;
  }
  const m = stepMean(losses);
  if (!m || !last) return null;
  const { auc: _auc, r2: _r2, ...rest } = last;
  return { ...rest, loss: m.mean, se: m.se, foldLosses: losses } as EvidenceCandidate;
}

/** Factors of the fitted prior weight tried for forward loss (a doubling grid, our choice), plus m = ∞. */
export const WEIGHT_FACTORS = [0.125, 0.25, 0.5, 1, 2, 4, 8] as const;
/** The grid when the fit found no spread (m = ∞): these weights, plus ∞. */
export const WEIGHTS_WITHOUT_FIT = [1, 4, 16, 64, 256] as const;

/** The flat target-encoding candidate with its prior weight chosen for forward loss. */
export async function forwardFlatCandidate(engine: Engine, col: number, column: ColumnProfile, kind: TargetKind, policy: AdvicePolicy): Promise<{ candidate: EvidenceCandidate; weight: ForwardWeight } | null> {
  if (!column.target) return null;
  const target = column.target;
  const fitted = target.prior.weight;
  const grid: PriorWeight[] = fitted === null ? [null, ...WEIGHTS_WITHOUT_FIT] : [...WEIGHT_FACTORS.map((f) => f * fitted), null];
  const tried: { weight: PriorWeight; loss: number; candidate: EvidenceCandidate }[] = [];
  for (const weight of grid) {
    const withWeight: ColumnProfile = { ...column, target: { ...target, prior: { ...target.prior, weight } } };
    const c = await scoreForward(policy.folds, () => flatCandidate(engine, col, withWeight, kind, policy));
    if (c) tried.push({ weight, loss: c.loss, candidate: c });
  }
  if (tried.length === 0) return null;
  const fittedEntry = tried.find((t) => t.weight === fitted) ?? null;
  // the lowest loss; equal losses (relative 1e-9) keep the fitted weight
  const best = tried.reduce((b, t) => (t.loss < b.loss - 1e-9 * Math.max(1, Math.abs(b.loss)) ? t : b), fittedEntry ?? tried[0]!);
  return {
    candidate: best.candidate,
    weight: { fitted, fittedLoss: fittedEntry?.loss ?? null, chosen: best.weight, chosenLoss: best.loss, tried: tried.map((t) => ({ weight: t.weight, loss: t.loss })) },
  };
}

/** A builder of evidenceFor; `flat` marks the flat target-encoding candidate (its weight is chosen forward). */
export interface TaggedBuilder { flat?: boolean; build: CandidateBuilder }

/** Every builder scored forward; the flat one with its weight chosen for forward loss. */
export async function forwardCandidates(engine: Engine, col: number, column: ColumnProfile, kind: TargetKind, policy: AdvicePolicy, builders: readonly TaggedBuilder[]): Promise<{ candidates: EvidenceCandidate[]; weight?: ForwardWeight }> {
  const candidates: EvidenceCandidate[] = [];
  let weight: ForwardWeight | undefined;
  for (const b of builders) {
    if (b.flat) {
      const flat = await forwardFlatCandidate(engine, col, column, kind, policy);
      if (flat) { candidates.push(flat.candidate); weight = flat.weight; }
      continue;
    }
    const c = await scoreForward(policy.folds, b.build);
    if (c) candidates.push(c);
  }
  return { candidates, ...(weight ? { weight } : {}) };
}

/** The sentence the reason starts with when the evidence is forward. */
export function forwardReasonPrefix(k: number): string {
  return `Scored forward in time (each of the ${k - 1} steps fits on the earlier time blocks and scores the next; loss = mean over the steps ± its SE): `;
}

const weightWords = (w: PriorWeight) => (w === null ? "∞" : fmt(w, 3));

/** The comparison sentence of forward evidence, with the k-fold scores of the same candidates beside. */
export function forwardComparisonText(e: Evidence, metric: string, items: readonly string[]): string {
  const kfold = (e.kfold ?? []).map((c) => `${label(c.candidate)} ${fmt(c.loss, 5)} ± ${fmt(c.se, 2)}`);
  const beside = kfold.length > 0 ? ` The same candidates scored ${e.folds}-fold over the same blocks (every other block, later ones included): ${kfold.join("; ")}.` : "";
  return `Forward ${metric} over ${e.folds - 1} steps (fit on the earlier time blocks, score the next), ± one standard error across steps: ${items.join("; ")}.${beside}`;
}

/** The sentence saying how the flat candidate's prior weight was chosen for forward loss. */
export function forwardWeightText(w: ForwardWeight): string {
  const fitted = w.fittedLoss === null ? "" : ` (forward loss ${fmt(w.fittedLoss, 5)})`;
  return w.chosen === w.fitted
    ? `Prior weight: the fitted m = ${weightWords(w.fitted)} has the lowest forward loss of the ${w.tried.length} weights tried (${fmt(w.chosenLoss, 5)}).`
    : `Prior weight chosen for forward loss: m = ${weightWords(w.chosen)} (forward loss ${fmt(w.chosenLoss, 5)}) instead of the fitted m = ${weightWords(w.fitted)}${fitted}, among ${w.tried.length} weights tried; it is chosen on the same steps it is scored on, so its loss is slightly optimistic.`;
}

/**
 * A flat target-kfold recommendation (not a user override) takes the weight chosen for forward
 * loss, with the sentence saying so; any other recommendation, or evidence without a forward
 * weight, is returned unchanged.
 */
export function withForwardWeight(rec: Recommendation, e: Evidence): Recommendation {
  const w = e.forwardWeight;
  if (!w || rec.overridden || rec.encoding !== "target-kfold" || rec.params.grouping !== undefined || rec.params.prior !== undefined) return rec;
  return { ...rec, params: { ...rec.params, weight: w.chosen }, reasons: [...rec.reasons, forwardWeightText(w)] };
}
