/**
 * drift/types: the DriftReport, what `tailsift drift` returns and prints as JSON. Shares are
 * fractions in [0, 1]; a figure that cannot be computed (no rows, column missing) is null, never
 * NaN. Keys may be added, none removed.
 */
import type { ColumnRole, Encoding, ScanTargetKind, TargetKind } from "./types.js";

export type DriftStatus = "ok" | "watch" | "act";

export interface Interval { low: number; high: number }

/** One check's outcome: a status and the sentence (with its numbers) that explains it. */
export interface Verdict { status: DriftStatus; reason: string }

/** The plan's and the new extract's target rate (binary) or mean (continuous) for one group. */
export interface RateShift {
  planRows: number;
  planRate: number | null;
  planInterval: Interval | null;
  rows: number;
  rate: number | null;
  interval: Interval | null;
  /** Cohen's effect size: h for proportions, d (in plan standard deviations) for means. */
  effect: number | null;
  /** True when the two intervals do not overlap. */
  separated: boolean;
}

export interface LevelShift extends RateShift {
  value: string;
  /** True when the new interval excludes the plan's level rate (reported, not a status rule). */
  excludesPlanRate: boolean;
}

export interface ColumnTargetShift {
  /** Confidence of each level's interval: 1 − 0.05/k over the k levels tested (Bonferroni). */
  confidence: number;
  /** The plan's top levels with a target rate on both sides. */
  tested: number;
  /** Levels whose new interval excludes the plan's rate. */
  flagged: number;
  /** Levels whose plan and new intervals do not overlap. */
  separated: number;
  levels: LevelShift[];
}

export interface ColumnDrift {
  name: string;
  role: ColumnRole;
  encoding: Encoding;
  present: boolean;
  rows: number;
  missing: number;
  distinct: number;
  /** Distinct non-missing levels of the new extract that the plan never saw. */
  newLevels: number;
  unseenRows: number;
  /** Rows whose non-missing level the plan never saw, over the non-missing rows. */
  unseenShare: number | null;
  /** Wilson 95 % interval of unseenShare (the new sample's own binomial noise). */
  unseenInterval: Interval | null;
  /** The plan's Good-Turing unseen-level rate and its interval. */
  unseenForecast: number | null;
  unseenForecastInterval: Interval | null;
  psi: number | null;
  /** Bins the PSI was taken over (the plan's top levels, the rest, missing; empty-on-both-sides bins left out). */
  psiBins: number;
  /** Distinct levels in the new extract over distinct levels in the plan. */
  distinctGrowth: number | null;
  targetShift?: ColumnTargetShift;
  status: DriftStatus;
  reasons: string[];
}

export interface DriftThresholds {
  psiWatch: number;
  psiAct: number;
  unseenActRatio: number;
  unseenActMin: number;
  effectAct: number;
}

export interface DriftTarget extends RateShift {
  column: string;
  kind: TargetKind;
  /** Target values in the new extract that fit the plan's target kind neither way (left out). */
  bad: number;
  status: DriftStatus;
  reasons: string[];
}

/** A multi-class target's class mix against the plan's (drift/classDrift). */
export interface DriftClasses {
  column: string;
  /** New-extract rows with a target value. */
  rows: number;
  psi: number | null;
  classes: { value: string; planShare: number; rows: number; share: number }[];
  /** Classes the plan does not know, largest first. */
  unknown: { value: string; rows: number }[];
  status: DriftStatus;
  reasons: string[];
}

export interface DriftReport {
  tool: { name: "tailsift"; version: string };
  createdAt: string;
  plan: {
    path: string; createdAt: string; paths: string[]; rows: number; fingerprint: string; top: number;
    target?: { column: string; kind: ScanTargetKind; mean: number };
  };
  input: {
    paths: string[]; rows: number; bytes: number; fingerprint: string; format: string;
    /** Plan columns compared that the new extract lacks. */
    missingColumns: string[];
    /** Columns of the new extract the plan does not know. */
    newColumns: string[];
  };
  thresholds: DriftThresholds;
  /** The overall target shift; absent when the plan has no target or the extract lacks it. */
  target?: DriftTarget;
  /** A multi-class target's class mix; absent otherwise or when the extract lacks it. */
  classes?: DriftClasses;
  columns: ColumnDrift[];
  status: DriftStatus;
}
