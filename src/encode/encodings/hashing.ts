/**
 * encode/encodings/hashing: the hashing trick (Weinberger et al. 2009): bucket =
 * md5_number_upper(salt ‖ level) mod width (engine/hashing); missing → NULL, unseen levels hash
 * like any level, so plain hashing needs no mapping table. Hashing of backoff groups (the
 * hierarchy's advice for identifier-like codes without a target) hashes each level's group key
 * instead and looks it up in the table encode/hashedGroupMap builds; "other" → width.
 */
import { HASH_NAME, bucketSql } from "../../engine/hashing.js";
import { lookupOf, ref } from "../expressions.js";
import type { EncodingModule } from "../encodingModule.js";
import { buildHashedGroupMap, hashedGroupFallbackCondition, hashedGroupFallbackRule } from "../hashedGroupMap.js";
import { hashedGroupManifestParams } from "../hierarchyManifest.js";
import type { EncodingSpec } from "../types.js";

type Spec = Extract<EncodingSpec, { encoding: "hashing" }>;

export const hashing: EncodingModule<Spec> = {
  outputNames: (c) => [c.name],
  outputHolds: () => [{}],
  outputType: "BIGINT",
  buildMap: (engine, c) => (c.spec.grouping ? buildHashedGroupMap(engine, c.index, c.name, c.spec.width, c.spec.salt, c.spec.grouping) : Promise.resolve(null)),
  columnSql: (c, ctx) => [c.spec.grouping ? `${lookupOf(c, ctx).value("bucket")}::BIGINT` : bucketSql(ref(c.name), c.spec.width, c.spec.salt)],
  fallbackCondition: (s) => (s.grouping ? hashedGroupFallbackCondition : "false"),
  fallbackRule: (s) => (s.grouping ? hashedGroupFallbackRule(s.width) : "missing → NULL (unseen levels hash like any level)"),
  manifestParams: (_e, c) => Promise.resolve(c.spec.grouping
    ? hashedGroupManifestParams(c.spec.width, c.spec.salt, c.spec.grouping)
    : { width: c.spec.width, salt: c.spec.salt, hash: HASH_NAME, value: "little-endian uint64 of the first 8 bytes of MD5(salt ‖ UTF-8 level), mod width" }),
};
