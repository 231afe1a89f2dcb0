/**
 * hierarchy/types: the JSON-friendly figures a column carries when its levels nest (codes whose
 * prefixes or leading tokens form groups). Plain numbers and strings only; bounded in size (at
 * most MAX_PARENTS parent rows, no level values).
 */

/** The delimiters a composite key may use between tokens. */
export const DELIMITERS = "-/.@:_ ";

/** Most candidate parents reported per column. */
export const MAX_PARENTS = 12;

/**
 * A parent of a level: its first `length` characters, or its first `count` tokens (with the
 * delimiters between them kept). A level shorter than its parent spec is its own parent.
 */
export type ParentSpec =
  | { kind: "prefix"; length: number }
  | { kind: "tokens"; count: number; delimiters: string };

/** One candidate parent measured over every level of the column. */
export interface ParentFigures {
  parent: ParentSpec;
  /** Distinct parents (groups). */
  groups: number;
  /** Share of non-missing rows in groups with at least minRows rows. */
  wellFilledRowShare: number;
  /** Median over groups of the group's rows. */
  medianGroupRows: number;
}

/** Backoff: a level maps to itself when it has minRows rows, else to its longest well-filled parent, else "other". */
export interface BackoffFigures {
  minRows: number;
  /** Groups a level maps to (levels kept plus parents used), "other" not counted. */
  groups: number;
  /** Share of non-missing rows mapped to a level or a parent (not "other"). */
  coverage: number;
  levelRowShare: number;
  parentRowShare: number;
  otherRowShare: number;
  /** Without a target, for identifier-like columns: hashing of the group keys, exact collisions. */
  hashing?: { width: number; collisionRowShare: number; hash: string };
}

export interface HierarchyFigures {
  pattern: "fixed-length" | "delimited";
  /** Fixed-length: a class per position (D digit, L letter), e.g. "DDDDD", "LLDDLL". Delimited: the delimiters in order, e.g. "-@". */
  shape: string;
  /** Levels looked at to detect the pattern, and the share of them that follow it. */
  sampledLevels: number;
  matchingShare: number;
  /** Candidate parents, shallowest first. */
  parents: ParentFigures[];
  /** The parent the hierarchical prior shrinks toward (the deepest with half its rows well filled). */
  priorParent: ParentSpec | null;
  backoff: BackoffFigures;
  /** Fixed-length codes whose trailing digits run almost without gaps (a counter, not a hierarchy). */
  counterLike: boolean;
  /** Backoff covers at least half the rows through real groups and the codes are not a counter. */
  useful: boolean;
}
