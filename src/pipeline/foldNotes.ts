/**
 * pipeline/foldNotes: what the record says about entity-grouped folds (--fold-by). For each
 * measured column (the key columns themselves excepted) it stores the nesting share
 * (engine/keyNesting) and, when the share of a categorical column reaches NESTING_THRESHOLD, adds a caution saying that
 * the column is nearly a label of the entity, why row-fold figures would be optimistic for it,
 * and that the figures in this record use the entity-grouped folds.
 */
import type { Engine } from "../engine/db.js";
import type { FoldContract } from "../engine/folds.js";
import { keyNestingShares, NESTING_THRESHOLD } from "../engine/keyNesting.js";
import type { Profile } from "../profile/types.js";

const percent = (x: number) => `${(100 * x).toFixed(1)} %`;

/** The caution for a column whose levels nest in the key's entities. */
export function nestingCaution(share: number, keyColumns: readonly string[]): string {
  const key = keyColumns.join(", ");
  return `${percent(share)} of this column's rows carry a level that occurs with a single ${key} only (at least ${percent(NESTING_THRESHOLD)}): `
    + `the column is nearly a label of the entity. With row folds an entity's other rows sit in the fitting folds, so its out-of-fold `
    + `figures would be optimistic; these figures use folds grouped by ${key}, so they are honest for entities the fit never saw.`;
}

/** Adds keyNesting and the nesting caution to the profile's columns (grouped folds only). */
export async function addFoldNotes(engine: Engine, view: string, profile: Profile, levelColumns: readonly string[], fold: FoldContract): Promise<void> {
  if (fold.kind !== "grouped") return;
  const measured = levelColumns.filter((c) => !fold.keyColumns.includes(c));
  const shares = await keyNestingShares(engine, view, measured, fold.keyColumns);
  measured.forEach((name, i) => {
    const share = shares[i];
    const column = profile.columns.find((c) => c.name === name);
    if (!column || share === null || share === undefined) return;
    column.keyNesting = { keyColumns: [...fold.keyColumns], share };
    // identifiers and constants are dropped: their out-of-fold figures decide nothing
    if (share >= NESTING_THRESHOLD && column.role === "categorical") {
      const rec = column.recommendation;
      column.recommendation = { ...rec, cautions: [...(rec.cautions ?? []), nestingCaution(share, fold.keyColumns)] };
    }
  });
}
