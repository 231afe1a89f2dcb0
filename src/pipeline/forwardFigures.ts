/**
 * pipeline/forwardFigures: the figures of time-ordered blocks (--time, fold kind time-blocks)
 * that sit beside the k-fold ones in the record: per level column, the forward unseen-level share
 * (engine/forwardUnseen: fit on blocks < b, share of block b's rows with a level never seen
 * before, mean over the K − 1 steps with its SE, and the last step's share), shown beside the
 * Good–Turing forecast from the whole extract; and per column with target figures, the leakage
 * score of its target encoding forward (engine/forwardLeakage, at the weight the in-sample and
 * out-of-fold scores use), beside them. scan calls it after advise, like foldNotes.
 */
import type { Engine } from "../engine/db.js";
import type { FoldContract } from "../engine/folds.js";
import { forwardLeakageSums } from "../engine/forwardLeakage.js";
import { forwardUnseenFigure, forwardUnseenSteps } from "../engine/forwardUnseen.js";
import { aucFromU } from "../stats/aucFromGroups.js";
import { rSquaredFromSums } from "../stats/rSquaredFromGroups.js";
import type { Profile } from "../profile/types.js";

/** Adds forwardUnseen to the profile's level columns (time-blocks folds only). */
export async function addForwardFigures(engine: Engine, profile: Profile, levelColumns: readonly string[], fold: FoldContract): Promise<void> {
  if (fold.kind !== "time-blocks") return;
  const steps = await forwardUnseenSteps(engine);
  levelColumns.forEach((name, col) => {
    const column = profile.columns.find((c) => c.name === name);
    const figure = forwardUnseenFigure(steps.get(col) ?? []);
    if (column && figure) column.forwardUnseen = figure;
  });
  if (!profile.target || profile.target.kind === "multiclass") return;
  const weights = new Map<number, number | null>();
  levelColumns.forEach((name, col) => {
    const t = profile.columns.find((c) => c.name === name)?.target;
    if (t) weights.set(col, t.leakage.weightUsed ?? t.prior.weight);
  });
  const kind = profile.target.kind;
  for (const s of await forwardLeakageSums(engine, weights, kind)) {
    const t = profile.columns.find((c) => c.name === levelColumns[s.col])?.target;
    if (t) t.leakage.forward = kind === "binary" ? aucFromU(s) : rSquaredFromSums(s.sse, s.sst);
  }
}
