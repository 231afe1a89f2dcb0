/**
 * profile/recommendation: a column's recommendation as a discriminated union — one parameter
 * type per encoding, so renderers and encode read `rec.params` after narrowing `rec.encoding`,
 * without casts. The JSON shape is the one profile.json has always had.
 */
import type { ParentSpec } from "./hierarchyTypes.js";

/**
 * A prior weight m of the m-estimate. `null` is "no detectable spread between levels": the
 * limit m → ∞, where every level takes the prior (JSON has no ∞). It is never 0 (0 = raw level
 * means, the opposite limit): test `weight === null` and use the prior; never `weight ?? 0`.
 */
export type PriorWeight = number | null;

export type Encoding =
  | "drop"
  | "indicator"
  | "one-hot"
  | "pooled-one-hot"
  | "target-kfold"
  | "hashing"
  | "frequency"
  | "codes"
  /** Numeric and target columns: passed through unchanged by encode (not a categorical encoding). */
  | "keep";

export const ENCODINGS: readonly Encoding[] = [
  "drop", "indicator", "one-hot", "pooled-one-hot", "target-kfold", "hashing", "frequency", "codes", "keep",
];

export interface DropParams { role?: "constant" | "identifier" }
/** A time column is kept as the time axis (role "time"); numeric and target columns carry no params. */
export interface KeepParams { role?: "time" }
export interface IndicatorParams { one: string | null; zero: string | null }
export interface OneHotParams { levels: string[] }
export interface PooledOneHotParams { keep: string[]; other: string; pooledRowShare: number; minRows: number }
export interface FrequencyParams { tableSize: number; unseen: number }
export interface PlainCodesParams { tableSize: number; order: string; unseen: number; grouping?: undefined }

/** Backoff grouping: parents deepest first, levels with fewer than minRows rows back off. */
export interface BackoffGroupingParams {
  grouping: "backoff";
  parents: ParentSpec[];
  minRows: number;
  groups: number;
  coverage: number;
}

export interface PlainHashingParams { width: number; collisionRowShare: number | null; hash: string; salt: string; grouping?: undefined }
export type GroupedHashingParams = Omit<PlainHashingParams, "grouping"> & BackoffGroupingParams;
export type HashingParams = PlainHashingParams | GroupedHashingParams;

/**
 * Codes over backoff groups (hierarchy/codedGroups, encode/codedGroupMap): the groups of a nesting
 * code numbered 1..tableSize by training rows; "other", unseen without a group and missing → 0.
 */
export type GroupedCodesParams = Omit<PlainCodesParams, "grouping"> & BackoffGroupingParams;
export type CodesParams = PlainCodesParams | GroupedCodesParams;

interface TargetBase {
  weight: PriorWeight;
  folds: number;
  seed: number;
  priorMean: number | null;
  fallback: "prior mean";
}
/** A multi-class target's class, encoded one against the rest (pipeline/multiclassAdvice). */
export interface ClassTargetParams { value: string; weight: PriorWeight; priorMean: number }
/**
 * Flat target encoding. With `classes` (a multi-class target) one output per class, each the
 * class's m-estimate with its own weight and prior; `weight` and `priorMean` are then null.
 */
export interface FlatTargetParams extends TargetBase { grouping?: undefined; prior?: undefined; classes?: ClassTargetParams[] }
export interface BackoffTargetParams extends TargetBase, BackoffGroupingParams { method: string; prior?: undefined }
export interface HierarchicalTargetParams extends TargetBase {
  prior: "hierarchical";
  parent: ParentSpec;
  parentWeight: PriorWeight;
  parentGroups: number | null;
  method: string | null;
  grouping?: undefined;
}
export type TargetKfoldParams = FlatTargetParams | BackoffTargetParams | HierarchicalTargetParams;

/** Encoding → its parameter type. */
export interface ParamsOf {
  "drop": DropParams;
  "keep": KeepParams;
  "indicator": IndicatorParams;
  "one-hot": OneHotParams;
  "pooled-one-hot": PooledOneHotParams;
  "target-kfold": TargetKfoldParams;
  "hashing": HashingParams;
  "frequency": FrequencyParams;
  "codes": CodesParams;
}

interface RecommendationBase {
  reasons: string[];
  cautions?: string[];
  overridden?: { from: Encoding; by: string };
}

/** One encoding with its own parameters. */
export type RecommendationOf<E extends Encoding> = RecommendationBase & { encoding: E; params: ParamsOf[E] };

export type Recommendation = { [E in Encoding]: RecommendationOf<E> }[Encoding];
