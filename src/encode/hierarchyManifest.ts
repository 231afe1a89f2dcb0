/**
 * encode/hierarchyManifest: the `mappings.json` parameters of target encoding over a hierarchy —
 * everything a serving system needs besides the Parquet tables: the parents, the weights, the
 * prior and the formulas in words, including how a level absent from the tables is encoded;
 * and those of the hashing of backoff groups (the same grouping, no target).
 */
import { HASH_NAME } from "../engine/hashing.js";
import { describeParent } from "../hierarchy/parent.js";
import type { ParentSpec } from "../hierarchy/types.js";
import type { EncodeMode, HashGrouping, TargetStructure } from "./types.js";

const weightWords = "a null weight is infinite: the group takes its prior";

const GROUPING_WORDS = "file: level → (depth, group_key) by the plan's rows: depth 0 = the level (≥ minRows rows), d ≥ 1 = its parent under depths[d − 1] "
  + "(the deepest whose still-unmapped rare levels pool ≥ minRows rows), −1 = \"other\" (group_key '')";

const depthsOf = (parents: readonly ParentSpec[]) => parents.map((parent, k) => ({ depth: k + 1, parent, words: describeParent(parent) }));

/** The parameters of hashing of backoff groups (encode/hashedGroupMap): buckets 0..width − 1, "other" = width. */
export function hashedGroupManifestParams(width: number, salt: string, g: HashGrouping): Record<string, unknown> {
  return {
    width, salt, hash: HASH_NAME, structure: "backoff", minRows: g.minRows, otherIndex: width,
    depths: depthsOf(g.parents), grouping: GROUPING_WORDS,
    unseen: "a level not in file (or seen = false): the largest depth d such that file has a row (d, its parent under depths[d − 1]), taking that row's bucket; none → \"other\"",
    value: "bucket = little-endian uint64 of the first 8 bytes of MD5(salt ‖ UTF-8 group_key), mod width; \"other\" (depth −1) is not hashed → width (buckets run 0..width); missing → NULL",
  };
}

/**
 * The parameters; `p` = the prior of the full-data values, `foldPriors` = the other-folds
 * priors of a training run (null when scoring).
 */
export function hierarchyManifestParams(s: TargetStructure, mode: EncodeMode, p: number | null, foldPriors: number[] | null): Record<string, unknown> {
  const training = mode === "training" ? { foldPriors } : {};
  if (s.kind === "backoff") {
    return {
      structure: "backoff", minRows: s.minRows, weight: s.weight, prior: p,
      depths: depthsOf(s.parents), grouping: GROUPING_WORDS,
      unseen: "a level not in file (or seen = false): the largest depth d such that groupFile has the group (d, its parent under depths[d − 1]); none → \"other\"",
      value: `group value = (sum_y + m·p)/(n_y + m) over the group's rows (groupFile); n_y = 0 → p; ${weightWords}; missing → p`,
      ...training,
      ...(mode === "training" ? { training: "out-of-fold: the (level, fold) row of foldFile, (S_g − S_g,f + m·prior_f)/(N_g − N_g,f + m) with prior_f = foldPriors[fold]; no other-fold rows → prior_f; missing → foldPriors[fold]" } : {}),
    };
  }
  return {
    structure: "hierarchical", parent: s.parent, parentWords: describeParent(s.parent), weight: s.weight, parentWeight: s.parentWeight, prior: p,
    value: `parent mean = (S_p + M·p)/(N_p + M) (parentFile; N_p = 0 → p); level value = (s_i + m·parent mean)/(n_i + m) (n_i = 0 → parent mean); m = weight, M = parentWeight; ${weightWords}; missing → p`,
    unseen: "a level not in file: its parent's value in parentFile; a parent not there → p",
    weights: "the plan's weights, fitted on all training rows (scan's evidence refits them on each fold's other folds)",
    ...training,
    ...(mode === "training" ? { training: "out-of-fold: the (level, fold) row of foldFile — every sum from the other folds, p = foldPriors[fold]; missing → foldPriors[fold]" } : {}),
  };
}
