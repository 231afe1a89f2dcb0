/**
 * advice/overrides: a user's `--decide col=encoding` replaces the advised choice. The record keeps
 * what was advised (`overridden.from`) and the reasons given for it, so a reviewer sees both.
 * The decision pipeline (pipeline/advise) applies it as its last decision step.
 */
import { TailsiftError } from "../errors.js";
import type { ColumnProfile, Encoding, Recommendation } from "../profile/types.js";
import { ENCODINGS } from "../profile/types.js";
import type { AdvicePolicy } from "./policy.js";

/** Parses "col=encoding" (the last '=' separates, so column names may contain '='). */
export function parseDecision(text: string): [string, Encoding] {
  const at = text.lastIndexOf("=");
  const column = at > 0 ? text.slice(0, at) : "";
  const encoding = ENCODINGS.find((e) => e === (at > 0 ? text.slice(at + 1).trim() : ""));
  if (column === "" || encoding === undefined || encoding === "keep") {
    throw new TailsiftError("bad_option", `--decide '${text}': use COLUMN=ENCODING with one of ${ENCODINGS.filter((e) => e !== "keep").join(", ")}`);
  }
  return [column, encoding];
}

/** The chosen encoding with the parameters the column's figures give it. */
function withParams(column: ColumnProfile, encoding: Encoding, policy: AdvicePolicy, reasons: string[]): Recommendation {
  const values = column.topLevels.map((l) => l.value).filter((v): v is string => v !== null);
  switch (encoding) {
    case "drop": return { encoding, params: {}, reasons };
    case "keep": return { encoding, params: {}, reasons };
    case "indicator": {
      if (column.distinct !== 2) throw new TailsiftError("bad_option", `--decide ${column.name}=indicator: the column has ${column.distinct} levels, an indicator needs exactly 2`);
      return { encoding, params: { one: values[1] ?? null, zero: values[0] ?? null }, reasons };
    }
    case "one-hot": return { encoding, params: { levels: values.slice(0, Math.min(values.length, Math.max(policy.maxOneHot, column.distinct))) }, reasons };
    case "pooled-one-hot": {
      const keep = column.topLevels.filter((l) => l.value !== null && l.rows >= policy.minLevelRows).slice(0, policy.maxOneHot - 1);
      const nonMissing = column.rows - column.missing;
      const keptRows = keep.reduce((s, l) => s + l.rows, 0);
      const params = { keep: keep.flatMap((l) => (l.value === null ? [] : [l.value])), other: "other", pooledRowShare: nonMissing > 0 ? 1 - keptRows / nonMissing : 0, minRows: policy.minLevelRows };
      return { encoding, params, reasons };
    }
    case "target-kfold": {
      if (!column.target) throw new TailsiftError("bad_option", `--decide ${column.name}=target-kfold needs --target`);
      // the fitted weight as it is: null (no detectable spread) stays m = ∞, every level takes the prior
      return { encoding, params: { weight: column.target.prior.weight, folds: policy.folds, seed: policy.seed, priorMean: column.target.prior.mean, fallback: "prior mean" }, reasons };
    }
    case "hashing": {
      const width = column.hashing?.width ?? 2 ** Math.min(policy.hashMaxBits, Math.max(policy.hashMinBits, Math.ceil(Math.log2(Math.max(1, column.distinct) * 4))));
      return { encoding, params: { width, collisionRowShare: column.hashing?.collisionRowShare ?? null, hash: "md5-first8-le", salt: "" }, reasons };
    }
    case "frequency": return { encoding, params: { tableSize: column.distinct, unseen: 0 }, reasons };
    case "codes": return { encoding, params: { tableSize: column.distinct, order: "descending training frequency", unseen: 0 }, reasons };
  }
}

/** The user's choice for `column`, recording what was advised (`advised`) and why. */
export function overrideRecommendation(column: ColumnProfile, encoding: Encoding, advised: Recommendation, policy: AdvicePolicy): Recommendation {
  const reasons = [`Chosen by the user with --decide ${column.name}=${encoding}; the rules advised ${advised.encoding}:`, ...advised.reasons.map((r) => `(advised) ${r}`)];
  return {
    ...withParams(column, encoding, policy, reasons),
    ...(advised.cautions ? { cautions: advised.cautions } : {}),
    overridden: { from: advised.encoding, by: "--decide" },
  };
}
