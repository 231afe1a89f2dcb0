/**
 * hierarchy/codedGroups: the backoff groups of an identifier-like nesting code (no target)
 * indexed rather than hashed — when the groups fit within the width cap 2^maxHashBits they are a
 * closed vocabulary, so each keeps its own code and none collide (advice/hashWidth). Encoded by
 * encode/codedGroupMap: groups numbered 1.. by training rows, "other" and missing → 0.
 */
import { cautionsFor } from "../advice/cautions.js";
import type { AdvicePolicy } from "../advice/policy.js";
import { count, pct } from "../advice/words.js";
import type { ColumnProfile, Recommendation } from "../profile/types.js";
import { describeParent, describeParentFigures } from "./parent.js";
import type { HierarchyFigures, ParentFigures } from "./types.js";

export function codedGroups(column: ColumnProfile, hierarchy: HierarchyFigures, policy: AdvicePolicy, shown: ParentFigures | undefined): Recommendation {
  const b = hierarchy.backoff;
  const h = b.hashing;
  const deepestFirst = [...hierarchy.parents].reverse();
  const nonMissing = column.rows - column.missing;
  const rec: Recommendation = {
    encoding: "codes",
    params: {
      tableSize: b.groups, order: "descending training frequency", unseen: 0,
      grouping: "backoff", parents: deepestFirst.map((p) => p.parent), minRows: b.minRows, groups: b.groups, coverage: b.coverage,
    },
    reasons: [
      `Backoff grouping, then codes: ${count(column.distinct)} distinct levels in ${count(nonMissing)} non-missing rows make the column identifier-like, but its levels are ${hierarchy.pattern} codes (shape '${hierarchy.shape}') that nest.`,
      ...(shown ? [`Parent ${describeParentFigures(shown, b.minRows)}.`] : []),
      `A level with at least ${count(b.minRows)} rows keeps its own group, a rarer one backs off to its longest parent with at least ${count(b.minRows)} rows (${deepestFirst.map((p) => describeParent(p.parent)).join(", then ")}), the rest go to "other": ${count(b.groups)} groups cover ${pct(b.coverage)} of non-missing rows (${pct(b.levelRowShare)} as levels, ${pct(b.parentRowShare)} through parents).`,
      `The ${count(b.groups)} groups are numbered 1 to ${count(b.groups)} by training rows ("other" and missing → 0): a closed vocabulary within the cap of ${count(2 ** policy.hashMaxBits)} (--max-hash-bits ${policy.hashMaxBits}) is indexed, not hashed, so no two groups share a code${h ? ` (hashing would have needed ${count(h.width)} buckets for ${pct(h.collisionRowShare, 2)} of rows to collide)` : ""}.`,
    ],
  };
  const cautions = cautionsFor(column, rec);
  return cautions.length > 0 ? { ...rec, cautions } : rec;
}
