/**
 * encode/encodings/registry: every encoding `encode` applies, mapped to its module (see
 * encode/encodingModule for what a module supplies). The one place that dispatches on the
 * encoding: the rest of encode asks `encoderOf(spec)`.
 */
import type { EncodingModule } from "../encodingModule.js";
import type { EncodedColumn, EncodingSpec } from "../types.js";
import { codes } from "./codes.js";
import { frequency } from "./frequency.js";
import { hashing } from "./hashing.js";
import { indicator } from "./indicator.js";
import { oneHot } from "./oneHot.js";
import { pooledOneHot } from "./pooledOneHot.js";
import { targetKfold } from "./targetKfold.js";

type Registry = { [E in EncodingSpec["encoding"]]: EncodingModule<Extract<EncodingSpec, { encoding: E }>> };

export const ENCODERS: Registry = {
  indicator,
  "one-hot": oneHot,
  "pooled-one-hot": pooledOneHot,
  hashing,
  frequency,
  codes,
  "target-kfold": targetKfold,
};

/** The module of a spec's encoding (the cast is safe: the registry is keyed by the spec's tag). */
export function encoderOf(spec: EncodingSpec): EncodingModule<EncodingSpec> {
  return ENCODERS[spec.encoding] as unknown as EncodingModule<EncodingSpec>;
}

/** The module of an encoded column. */
export const encoderFor = (column: EncodedColumn): EncodingModule<EncodingSpec> => encoderOf(column.spec);
