/**
 * encode/types: the shapes `tailsift encode` works with — the validated encoding of one column,
 * what the output holds, and the summary printed at the end.
 */
import type { Encoding } from "../profile/types.js";

export type EncodeMode = "training" | "scoring";

/** A plan column's encoding with its parameters checked (see encode/params.ts). */
export type EncodingSpec =
  | { encoding: "indicator"; one: string | null; zero: string | null }
  | { encoding: "one-hot"; levels: string[] }
  | { encoding: "pooled-one-hot"; keep: string[]; other: string }
  | { encoding: "hashing"; width: number; salt: string }
  | { encoding: "frequency" }
  | { encoding: "codes"; tableSize: number }
  | { encoding: "target-kfold"; weight: number };

/** One column that is encoded; `index` numbers the encoded columns (temp table and type names). */
export interface EncodedColumn {
  name: string;
  index: number;
  spec: EncodingSpec;
}

/** One item of the output, in output order. */
export type OutputItem =
  | { kind: "pass"; column: string }
  | { kind: "encoded"; column: EncodedColumn }
  | { kind: "text"; column: string };

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
}

export interface EncodeSummary {
  mode: EncodeMode;
  output: string;
  format: "parquet" | "csv";
  mappings: string;
  rows: number;
  foldColumn?: string;
  /** Where target and level sums of a training run came from. */
  levelSource: "plan level table" | "input pass" | "none";
  /** How mapped values were looked up: ENUM lists (no sort) or joins restored to input order. */
  lookup: "enum" | "join";
  columns: ColumnSummary[];
  /** Columns written unchanged (numeric, target, --keep). */
  passedThrough: string[];
  /** Plan columns dropped by the plan. */
  dropped: string[];
  /** Input columns the plan does not know (not written unless --keep names them). */
  notInPlan: string[];
}
