/**
 * encode/encodings/oneHot: one 0/1 column per listed level, named `column=level` (raw); missing,
 * unseen and unlisted levels are 0 in every column. No mapping table.
 */
import { isLevelSql, ref } from "../expressions.js";
import { notInLevels, type EncodingModule } from "../encodingModule.js";
import type { EncodingSpec } from "../types.js";

type Spec = Extract<EncodingSpec, { encoding: "one-hot" }>;

export const oneHot: EncodingModule<Spec> = {
  outputNames: (c) => c.spec.levels.map((l) => `${c.name}=${l}`),
  outputHolds: (c) => c.spec.levels.map((level) => ({ level })),
  outputType: "INTEGER",
  buildMap: () => Promise.resolve(null),
  columnSql: (c) => c.spec.levels.map((l) => isLevelSql(ref(c.name), l)),
  fallbackCondition: (s) => `l.level IS NOT NULL${notInLevels(s.levels)}`,
  fallbackRule: () => "missing, unseen and unlisted levels → all columns 0",
  manifestParams: (_e, c) => Promise.resolve({ levels: c.spec.levels, value: "column=level is 1 for that level, else 0" }),
};
