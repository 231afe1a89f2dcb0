/**
 * hierarchy/applyHierarchy: the advice for an identifier-like column without a target when its
 * codes nest. A postcode seen once per row cannot be encoded level by level, but rare codes can
 * back off to a well-filled parent (its district), and those groups are numbered (codes, when
 * they fit the width cap: hierarchy/codedGroups) or hashed like levels (past the cap).
 */
import { cautionsFor } from "../advice/cautions.js";
import type { AdvicePolicy } from "../advice/policy.js";
import { count, pct } from "../advice/words.js";
import type { ColumnProfile, Recommendation } from "../profile/types.js";
import { codedGroups } from "./codedGroups.js";
import { describeParent, describeParentFigures } from "./parent.js";
import type { HierarchyFigures } from "./types.js";

/**
 * Returns the backoff-then-codes (or, past the cap, backoff-then-hashing) recommendation, or the column's existing recommendation when
 * it should stand: a user override, a role other than identifier, a hierarchy that is not useful
 * (a counter, or backoff covering under half the rows) or no measured hashing of the groups.
 */
export function applyHierarchy(column: ColumnProfile, hierarchy: HierarchyFigures, policy: AdvicePolicy): Recommendation {
  const was = column.recommendation;
  const b = hierarchy.backoff;
  const h = b.hashing;
  if (was.overridden || column.role !== "identifier" || !hierarchy.useful || !h) return was;
  const nonMissing = column.rows - column.missing;
  const deepestFirst = [...hierarchy.parents].reverse();
  const shown = hierarchy.parents.find((p) => JSON.stringify(p.parent) === JSON.stringify(hierarchy.priorParent)) ?? hierarchy.parents[0];
  // advice/hashWidth: groups that fit the width cap form a closed vocabulary, indexed, not hashed
  if (b.groups >= 1 && b.groups <= 2 ** policy.hashMaxBits) return codedGroups(column, hierarchy, policy, shown);
  const rec: Recommendation = {
    encoding: "hashing",
    params: {
      width: h.width, collisionRowShare: h.collisionRowShare, hash: h.hash, salt: "",
      grouping: "backoff", parents: deepestFirst.map((p) => p.parent), minRows: b.minRows, groups: b.groups, coverage: b.coverage,
    },
    reasons: [
      `Backoff grouping, then hashing: ${count(column.distinct)} distinct levels in ${count(nonMissing)} non-missing rows make the column identifier-like, but its levels are ${hierarchy.pattern} codes (shape '${hierarchy.shape}') that nest.`,
      ...(shown ? [`Parent ${describeParentFigures(shown, b.minRows)}.`] : []),
      `A level with at least ${count(b.minRows)} rows keeps its own group, a rarer one backs off to its longest parent with at least ${count(b.minRows)} rows (${deepestFirst.map((p) => describeParent(p.parent)).join(", then ")}), the rest go to "other": ${count(b.groups)} groups cover ${pct(b.coverage)} of non-missing rows (${pct(b.levelRowShare)} as levels, ${pct(b.parentRowShare)} through parents).`,
      `The group keys are hashed into ${count(h.width)} buckets; ${pct(h.collisionRowShare, 2)} of rows share a bucket with another group (budget ${pct(policy.collisionBudget, 1)}).`,
    ],
  };
  const cautions = cautionsFor(column, rec);
  return cautions.length > 0 ? { ...rec, cautions } : rec;
}
