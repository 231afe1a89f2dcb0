/**
 * encode/types: the shapes `tailsift encode` works with — the validated encoding of one column,
 * what the output holds, and the summary printed at the end.
 */
import type { ParentSpec } from "../profile/hierarchyTypes.js";
import type { MappingFile } from "./mappingFiles.js";
import type { Encoding } from "../profile/types.js";

export type EncodeMode = "training" | "scoring";

/** A plan column's encoding with its parameters checked (see encode/params.ts). */
export type EncodingSpec =
  | { encoding: "indicator"; one: string | null; zero: string | null }
  | { encoding: "one-hot"; levels: string[] }
  | { encoding: "pooled-one-hot"; keep: string[]; other: string }
  | { encoding: "hashing"; width: number; salt: string; grouping?: undefined }
  | { encoding: "hashing"; width: number; salt: string; grouping: HashGrouping }
  | { encoding: "frequency" }
  | { encoding: "codes"; tableSize: number; grouping?: undefined }
  /** Codes over backoff groups (encode/codedGroupMap). */
  | { encoding: "codes"; tableSize: number; grouping: HashGrouping }
  /** weight null: no detectable spread, m = ∞ (every level takes the prior). */
  | { encoding: "target-kfold"; weight: number | null; structure?: undefined; classes?: undefined }
  | { encoding: "target-kfold"; structure: TargetStructure; classes?: undefined }
  /** A multi-class target (encode/encodings/targetClasses): one output per class but `dropped`. */
  | { encoding: "target-kfold"; classes: ClassSpec[]; dropped: number | null; structure?: undefined; weight?: undefined };

/**
 * One class of a multi-class target encoding: its m (null = ∞) and its share of the plan's rows
 * with a target (the scoring prior, as the plan's target mean is for a binary target).
 */
export interface ClassSpec { value: string; weight: number | null; share: number }

/**
 * Target encoding over a level hierarchy (the evidence's backoff and hierarchical candidates).
 * A null weight is infinite: the group, or the level, takes its prior (evidence/baseSql).
 *  - backoff: `parents` shallowest first (depth d = parents[d − 1]); levels grouped as
 *    hierarchy/backoff groups them, then each group's m-estimate with weight m;
 *  - hierarchical: level → parent (weight m) → overall mean (weight parentWeight).
 */
export type TargetStructure =
  | { kind: "backoff"; parents: ParentSpec[]; minRows: number; weight: number | null }
  | { kind: "hierarchical"; parent: ParentSpec; weight: number | null; parentWeight: number | null };

/**
 * Hashing of backoff groups (hierarchy/applyHierarchy's advice for identifier-like codes without
 * a target): `parents` shallowest first (depth d = parents[d − 1]); each level goes to its backoff
 * group (hierarchy/backoff's rule over the plan's rows, minRows), whose key text is hashed into
 * 0..width − 1; the "other" group takes the extra index `width` (encode/hashedGroupMap).
 */
export interface HashGrouping { kind: "backoff"; parents: ParentSpec[]; minRows: number }

/** One column that is encoded; `index` numbers the encoded columns (temp table and type names). */
export interface EncodedColumn {
  name: string;
  index: number;
  spec: EncodingSpec;
}

/** How a passed-through column is written (encode/passThrough). */
export type PassType = "text" | "integer" | "double" | "target";

/** The mapping tables one column's encoding built (encode/encodings/*). */
export interface ColumnMap {
  /** The table the output query looks up (keyed by level, or by level and fold). */
  table: string;
  fields: string[];
  perFold: boolean;
  /** Tables written beside the output (see MappingFile). */
  files: MappingFile[];
  /** Backoff (target or hashing) / hierarchical: the per-level table the grouping counts read (encode/hierarchyCounts). */
  levelTable?: string;
}

export interface MapContext {
  mode: EncodeMode;
  leaveOneOut: boolean;
  folds: number;
  /**
   * Training with a time-blocks plan (--time): past-only maps — each row of block b encoded from
   * blocks < b only (encode/targetMaps pastSumsSql); block 0 has no past and takes the prior.
   */
  pastOnly?: boolean;
  /** The plan's target mean (p of the scoring mapping). */
  targetMean: number | undefined;
}

/** One item of the output, in output order. */
export type OutputItem =
  | { kind: "pass"; column: string; type: PassType }
  | { kind: "encoded"; column: EncodedColumn }
  | { kind: "text"; column: string };

export type OutputSqlType = "INTEGER" | "BIGINT" | "DOUBLE" | "VARCHAR";

/** One column of the output file (encode/outputColumns): the map from output name to (column, level). */
export interface OutputColumn {
  /** The name written (safe by default, raw with --raw-names). */
  name: string;
  /** Today's raw name: `column`, `column=level`, `column__text`, the fold column. */
  rawName: string;
  /** The input column it comes from (the fold column's own name for the fold). */
  column: string;
  kind: "encoded" | "pass" | "text" | "fold";
  /** One-hot and pooled one-hot: the level this column is 1 for; indicator: the level `one`. */
  level?: string | null;
  /** Pooled one-hot: the column that is 1 for every other non-missing level. */
  pooled?: true;
  /** Target encoding of a multi-class target: the class this column estimates. */
  class?: string;
  /** The type in Parquet (CSV writes the same values as text). */
  type: OutputSqlType;
}

/** Per encoded column: where its rows went. Counts are rows of the encoded input. */
export interface ColumnSummary {
  column: string;
  encoding: Encoding;
  outputs: string[];
  /** Rows whose level is missing (NULL or empty field). */
  missing: number;
  /** Rows whose level the plan's level table (the training extract) never saw. */
  unseen: number;
  /** Rows of non-missing levels that received the documented fallback (see `fallbackRule`). */
  fallback: number;
  /** In words: what missing, unseen and fallback rows receive. */
  fallbackRule: string;
  /** The mapping file for this column, relative to the mappings folder (if any). */
  file?: string;
  /** Backoff and hierarchical target encoding, hashing of backoff groups: where the input's levels went. */
  grouping?: GroupingCounts;
}

/**
 * Distinct non-missing input levels (and their rows) by what they received. Backoff (target
 * encoding or hashing of the groups): `own` = kept as their own group, `parent` = backed off to a
 * parent group, `other` = the "other" group.
 * Hierarchical (judged on the full-data sums and the weights): `own` = the level's own
 * smoothed mean, `parent` = no target rows of its own (or a null level weight), so its
 * parent's mean, `other` = neither, so the prior. `unseen` = levels absent from the plan's
 * level table (also counted in the class they fell into).
 */
export interface GroupingCounts {
  kind: TargetStructure["kind"];
  own: LevelRows;
  parent: LevelRows;
  other: LevelRows;
  unseen: LevelRows;
}

export interface LevelRows { levels: number; rows: number }

export interface EncodeSummary {
  mode: EncodeMode;
  output: string;
  format: "parquet" | "csv";
  mappings: string;
  rows: number;
  foldColumn?: string;
  /** Where the input's level table (training target sums, summary counts) came from. */
  levelSource: "plan level table" | "input pass" | "input pass (content differs from the plan's scan)" | "none";
  /** How mapped values were looked up: ENUM lists (no sort) or joins restored to input order. */
  lookup: "enum" | "join";
  columns: ColumnSummary[];
  /** Every output column in order: written name → (column, level, type). */
  outputColumns: OutputColumn[];
  /** Whether names are safe (default) or raw (--raw-names). */
  names: "safe" | "raw";
  /** CSV/TSV: the prefix put before formula-like text cells, or null when off (or Parquet). */
  cellGuard: string | null;
  /** Columns written unchanged (numeric, target, --keep). */
  passedThrough: string[];
  /** Plan columns dropped by the plan. */
  dropped: string[];
  /** Input columns the plan does not know (not written unless --keep names them). */
  notInPlan: string[];
}
