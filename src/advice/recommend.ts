/**
 * advice/recommend: the rules described in DEVELOPERS.md ("Adding a rule"), in
 * order. Each rule returns a recommendation with parameters and reasons (sentences carrying the
 * numbers that decided), or null to pass the column on to the next rule.
 */
import type { ColumnProfile, ProfileTarget, Recommendation } from "../profile/types.js";
import type { AdvicePolicy } from "./policy.js";
import { constantRule, identifierRule } from "./rules/dropRules.js";
import { indicatorRule, oneHotRule, pooledOneHotRule } from "./rules/oneHotRules.js";
import { hashingRule } from "./rules/hashingRule.js";
import { targetRule } from "./rules/targetRule.js";
import { cautionsFor } from "./cautions.js";

export type Rule = (column: ColumnProfile, policy: AdvicePolicy, target: ProfileTarget | undefined) => Recommendation | null;

export const RULES: readonly Rule[] = [constantRule, identifierRule, indicatorRule, oneHotRule, pooledOneHotRule, targetRule, hashingRule];

/** Runs the rules in order; the last rule (hashing) always answers. */
export function recommend(column: ColumnProfile, policy: AdvicePolicy, target: ProfileTarget | undefined): Recommendation {
  for (const rule of RULES) {
    const rec = rule(column, policy, target);
    if (rec) {
      const cautions = cautionsFor(column, rec);
      return cautions.length > 0 ? { ...rec, cautions } : rec;
    }
  }
  throw new Error(`no rule answered for column '${column.name}'`);
}
