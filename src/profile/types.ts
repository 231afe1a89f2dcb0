import type { FoldContract } from "../engine/folds.js";
import type { ForwardUnseen } from "../engine/forwardUnseen.js";
import type { TargetKind } from "../engine/target.js";
import type { Evidence } from "./evidenceTypes.js";
import type { HierarchyFigures } from "./hierarchyTypes.js";
import type { Encoding, PriorWeight, Recommendation } from "./recommendation.js";

export type { ScanTargetKind, TargetKind } from "../engine/target.js";
export { ENCODINGS, type Encoding, type PriorWeight, type Recommendation } from "./recommendation.js";
export type { FoldContract } from "../engine/folds.js";

/**
 * The Profile: the JSON contract between commands (profile.json). Keys follow
 * the design in DEVELOPERS.md ("The profile contract"); more may be added, none removed. Shares are fractions in [0, 1].
 */

export type ColumnRole = "categorical" | "identifier" | "constant" | "numeric" | "time" | "target" | "excluded";

export interface Profile {
  tool: { name: "tailsift"; version: string; engine?: string };
  createdAt: string;
  /** The id of the plan set written by scan --out (plan/integrity); absent in printed profiles. */
  planId?: string;
  input: {
    paths: string[];
    rows: number;
    bytes: number;
    fingerprint: string;
    /** Row count and order-independent sum of row hashes, from the scan's pass (engine/contentFingerprint). */
    contentFingerprint?: string;
    format?: string;
    skippedRows?: number;
    redacted?: boolean;
    fromLevels?: boolean;
  };
  target?: ProfileTarget | MulticlassTarget;
  settings: ProfileSettings;
  columns: ColumnProfile[];
}

/** The target the pipeline measures: binary (also one class against the rest) or continuous. */
export interface ProfileTarget {
  column: string;
  kind: TargetKind;
  positive?: string;
  /** Rows with a usable target value. */
  rows: number;
  /** Rows whose target is missing (left out of every target figure). */
  missing: number;
  /** Binary: the positive share; continuous: the mean. */
  mean: number;
  /** Continuous targets: population standard deviation of the target. */
  sd?: number;
}

export interface ProfileSettings {
  folds: number;
  seed: number;
  top: number;
  /** How rows were assigned to folds (engine/folds); absent in profiles written before it. */
  fold?: FoldContract;
  /** Profiles written before settings.fold: the fold hash and the columns it read. */
  foldHash?: string;
  foldColumns?: string[];
  maxOneHot?: number;
  minLevelRows?: number;
  coverage?: number;
  collisionBudget?: number;
  /** --max-hash-bits: no hash width above 2^maxHashBits (encode and tailsift sql refuse a wider plan); absent in older profiles. */
  maxHashBits?: number;
  /** --missing-like: values read as missing in every column (engine/missingLike), normalised. */
  missingLike?: string[];
  [k: string]: unknown;
}

export interface LevelFigure {
  value: string | null;
  rows: number;
  share: number;
  targetMean?: number;
  low?: number;
  high?: number;
  smoothed?: number;
  flag?: "above" | "below";
}

export interface ColumnTargetFigures {
  /** weight null: no detectable spread (m = ∞, the prior), never 0. */
  prior: { method: string; weight: PriorWeight; mean: number; rho?: number | null; tau2?: number | null };
  /** Levels whose 95 % interval excludes the overall mean. */
  flaggedLevels: number;
  /** Flags expected by chance alone at that number of levels (5 % of levels with an interval). */
  expectedFalseFlags: number;
  /** Levels with an interval (n >= 1 binary, n >= 2 continuous). */
  testedLevels?: number;
  /** forward: with --time, the same encoding scored forward (blocks ≥ 1, each from earlier blocks; engine/forwardLeakage). */
  leakage: { inSample: number | null; outOfFold: number | null; metric: "auc" | "r2"; weightUsed?: PriorWeight; forward?: number | null };
  /** Funnel-plot points: rate against rows for up to a bounded number of levels (report only). */
  funnel?: { value: string | null; rows: number; rate: number }[];
}

/**
 * A multi-class target, measured one class against the rest (pipeline/multiclass). `mean` is the
 * share of the largest class (what always predicting it gets right).
 */
export interface MulticlassTarget extends Omit<ProfileTarget, "kind" | "positive" | "sd"> {
  kind: "multiclass";
  /** Every class, sorted by code unit, with its rows and share of `rows`. */
  classes: TargetClass[];
}

export interface TargetClass { value: string; rows: number; share: number }

/**
 * A multi-class target: one class against the rest — exactly the figures a binary scan with
 * --positive CLASS gives this column (pipeline/multiclass).
 */
export interface ClassFigures {
  value: string;
  target: ColumnTargetFigures;
  /** The class's rate in each of the column's top levels (same order as topLevels), with its Wilson interval. */
  levels: Pick<LevelFigure, "targetMean" | "low" | "high" | "smoothed" | "flag">[];
  evidence?: Evidence;
  /** What the binary path advises for this class against the rest. */
  advised: Encoding;
}

/** A multi-class target: the column scored by the out-of-fold multi-class log loss (engine/multiclassLoss). */
export interface MulticlassEvidence {
  metric: "multiclass-log-loss";
  /** Folds scored (k-fold), or with validation "forward" the forward steps (--time: blocks 1..K−1). */
  folds: number;
  validation?: "forward";
  rows: number;
  candidates: { candidate: "class-shares" | "target-kfold"; loss: number; se: number | null; foldLosses: number[] }[];
  chosen: "class-shares" | "target-kfold";
  reason: string;
}

export interface ColumnProfile {
  name: string;
  role: ColumnRole;
  /** Numeric columns: the type encode writes (scan's sample: integer when every value is a plain integer). */
  numberType?: "integer" | "double";
  rows: number;
  missing: number;
  distinct: number;
  entropyBits: number;
  effectiveLevels: number;
  singletons: number;
  unseenRate: number;
  unseenInterval?: { low: number; high: number };
  coverage: { share: number; levels: number }[];
  rare: { minRows: number; levels: number; rowShare: number }[];
  variants?: { groups: number; levels: number; rowShare: number; examples: string[][] };
  topLevels: LevelFigure[];
  /** Count-of-counts (rows per level → number of levels), bounded (≈ sqrt(2N) entries). */
  countOfCounts?: { count: number; levels: number }[];
  target?: ColumnTargetFigures;
  /** Multi-class targets: the figures of each class against the rest (the column has no `target`). */
  classes?: ClassFigures[];
  /** Multi-class targets: class shares against one-vs-rest target encoding, multi-class log loss out-of-fold. */
  multiclassEvidence?: MulticlassEvidence;
  hashing?: {
    width: number;
    collisionRowShare: number;
    hash?: string;
    candidates: { width: number; collisionRowShare: number; collidingLevels?: number }[];
    /** advice/hashWidth: collisions are counted over the rows of levels with at least minRows rows. */
    frequent?: { minRows: number; levels: number; rowShare: number };
    /** No width up to the cap (2^maxHashBits) is within the budget. */
    atCap?: boolean;
    /** The frequent levels fit the cap: index them ("codes") instead of hashing. */
    index?: boolean;
  };
  /** Structured codes: detected parents and the backoff grouping (issue: grouping advisor). */
  hierarchy?: HierarchyFigures;
  /** Candidate encodings scored out-of-fold and the one-standard-error choice. */
  evidence?: Evidence;
  /** Numeric columns (role numeric, or identifier when the numbers are a row key): how many values. */
  numericValues?: NumericValues;
  /** Time columns (role time): exact range and granularity. */
  time?: TimeFigures;
  /** Levels spelled like a missing value ("unknown", "N/A", "[no title]"…), counted beside `missing`. */
  placeholders?: PlaceholderFigures;
  recommendation: Recommendation;
  /** With --fold-by: the share of rows whose level stays within one entity of the key (engine/keyNesting). */
  keyNesting?: { keyColumns: string[]; share: number };
  /** With --time: the unseen-level share measured forward over the time blocks (engine/forwardUnseen). */
  forwardUnseen?: ForwardUnseen;
}

export interface NumericValues {
  /** Distinct values: exact (counted in the pass) or over the first `sampledRows` rows. */
  distinct: number;
  exact: boolean;
  sampledRows?: number;
  /** Every sampled value is an integer. */
  integer: boolean;
  /** Exact counts: rows of the most repeated value. */
  maxRows?: number;
}

export interface TimeFigures {
  /** Earliest and latest value as written (offsets ignored): YYYY-MM-DD at day granularity, else YYYY-MM-DD HH:MM:SS[.f]. */
  min: string | null;
  max: string | null;
  granularity: "day" | "hour" | "minute" | "second" | "sub-second";
  /** Non-missing rows whose value reads as a date or timestamp, and those that do not. */
  parsedRows: number;
  unparsedRows: number;
  /** Share of the sampled non-missing values that read as a time (the role threshold is 0.95). */
  sampledShare: number;
  /** Calendar parts worth deriving, e.g. "day of week", "month", "hour". */
  calendarParts: string[];
}

export interface PlaceholderFigures {
  /** Rows and levels whose value is spelled like a missing value (profile/placeholders). */
  rows: number;
  levels: number;
  /** The largest such levels with the list entry each matched. */
  top: { value: string; rows: number; entry: string }[];
}
