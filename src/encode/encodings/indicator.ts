/**
 * encode/encodings/indicator: one 0/1 column, 1 for the level `one`, else 0 (missing, the level
 * `zero`, other and unseen levels → 0). No mapping table: the parameters define it.
 */
import { isLevelSql, ref } from "../expressions.js";
import { notInLevels, type EncodingModule } from "../encodingModule.js";
import type { EncodingSpec } from "../types.js";

type Spec = Extract<EncodingSpec, { encoding: "indicator" }>;

export const indicator: EncodingModule<Spec> = {
  outputNames: (c) => [c.name],
  outputHolds: (c) => [{ level: c.spec.one }],
  outputType: "INTEGER",
  buildMap: () => Promise.resolve(null),
  columnSql: (c) => [isLevelSql(ref(c.name), c.spec.one)],
  fallbackCondition: (s) => `l.level IS NOT NULL${notInLevels([s.one, s.zero])}`,
  fallbackRule: () => "missing and other levels → 0",
  manifestParams: (_e, c) => Promise.resolve({ one: c.spec.one, zero: c.spec.zero, value: "1 when the level is `one`, else 0" }),
};
