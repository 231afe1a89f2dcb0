/**
 * encode/encodings/pooledOneHot: one-hot of the kept levels plus one pooled column that is 1 for
 * any other non-missing level (pooled or unseen); missing rows are 0 in every column. The pooled
 * column's raw name is `column=<other>` (encode/names.pooledLabel keeps it apart from a kept
 * level of the same text). No mapping table.
 */
import { quoteLiteral } from "../../engine/sql.js";
import { isLevelSql, ref } from "../expressions.js";
import { notInLevels, type EncodingModule } from "../encodingModule.js";
import { pooledLabel } from "../names.js";
import type { EncodingSpec } from "../types.js";

type Spec = Extract<EncodingSpec, { encoding: "pooled-one-hot" }>;

export const pooledOneHot: EncodingModule<Spec> = {
  outputNames: (c) => [...c.spec.keep, pooledLabel(c.spec.keep, c.spec.other)].map((l) => `${c.name}=${l}`),
  outputHolds: (c) => [...c.spec.keep.map((level) => ({ level })), { pooled: true as const }],
  outputType: "INTEGER",
  buildMap: () => Promise.resolve(null),
  columnSql: (c) => {
    const col = ref(c.name);
    const notKept = c.spec.keep.length === 0 ? "" : ` AND ${col} NOT IN (${c.spec.keep.map(quoteLiteral).join(", ")})`;
    return [...c.spec.keep.map((l) => isLevelSql(col, l)), `(${col} IS NOT NULL${notKept})::INTEGER`];
  },
  fallbackCondition: (s) => `l.level IS NOT NULL${notInLevels(s.keep)}`,
  fallbackRule: () => "pooled and unseen levels → the other column; missing → all columns 0",
  manifestParams: (_e, c, outputs) => Promise.resolve({
    keep: c.spec.keep, otherColumn: outputs[outputs.length - 1] ?? `${c.name}=${pooledLabel(c.spec.keep, c.spec.other)}`,
    value: "kept levels one-hot; other = 1 for any other non-missing level",
  }),
};
