/**
 * advice/overrides: a user's `--decide col=encoding` replaces the rule's choice. The record keeps
 * what the rules advised (`overridden.from`) and the reasons they gave, so a reviewer sees both.
 */
import { TailsiftError } from "../errors.js";
import type { ColumnProfile, Encoding, Recommendation } from "../profile/types.js";
import { ENCODINGS } from "../profile/types.js";
import type { AdvicePolicy } from "./policy.js";

/** Parses "col=encoding" (the last '=' separates, so column names may contain '='). */
export function parseDecision(text: string): [string, Encoding] {
  const at = text.lastIndexOf("=");
  const column = at > 0 ? text.slice(0, at) : "";
  const encoding = at > 0 ? text.slice(at + 1).trim() : "";
  if (column === "" || !(ENCODINGS as readonly string[]).includes(encoding) || encoding === "keep") {
    throw new TailsiftError("bad_option", `--decide '${text}': use COLUMN=ENCODING with one of ${ENCODINGS.filter((e) => e !== "keep").join(", ")}`);
  }
  return [column, encoding as Encoding];
}

function paramsFor(column: ColumnProfile, encoding: Encoding, policy: AdvicePolicy): Record<string, unknown> {
  const values = column.topLevels.map((l) => l.value).filter((v): v is string => v !== null);
  switch (encoding) {
    case "drop": return {};
    case "indicator": {
      if (column.distinct !== 2) throw new TailsiftError("bad_option", `--decide ${column.name}=indicator: the column has ${column.distinct} levels, an indicator needs exactly 2`);
      return { one: values[1], zero: values[0] };
    }
    case "one-hot": return { levels: values.slice(0, Math.min(values.length, Math.max(policy.maxOneHot, column.distinct))) };
    case "pooled-one-hot": {
      const keep = column.topLevels.filter((l) => l.value !== null && l.rows >= policy.minLevelRows).slice(0, policy.maxOneHot - 1);
      const nonMissing = column.rows - column.missing;
      const keptRows = keep.reduce((s, l) => s + l.rows, 0);
      return { keep: keep.map((l) => l.value), other: "other", pooledRowShare: nonMissing > 0 ? 1 - keptRows / nonMissing : 0, minRows: policy.minLevelRows };
    }
    case "target-kfold": {
      if (!column.target) throw new TailsiftError("bad_option", `--decide ${column.name}=target-kfold needs --target`);
      return { weight: column.target.prior.weight ?? 0, folds: policy.folds, seed: policy.seed, priorMean: column.target.prior.mean, fallback: "prior mean" };
    }
    case "hashing": {
      const width = column.hashing?.width ?? 2 ** Math.min(policy.hashMaxBits, Math.max(policy.hashMinBits, Math.ceil(Math.log2(Math.max(1, column.distinct) * 4))));
      return { width, collisionRowShare: column.hashing?.collisionRowShare ?? null, hash: "md5-first8-le", salt: "" };
    }
    case "frequency": return { tableSize: column.distinct, unseen: 0 };
    case "codes": return { tableSize: column.distinct, order: "descending training frequency", unseen: 0 };
    default: return {};
  }
}

/** Applies `--decide` overrides in place. */
export function applyOverrides(columns: ColumnProfile[], decide: Record<string, Encoding>, policy: AdvicePolicy): void {
  for (const [name, encoding] of Object.entries(decide)) {
    const column = columns.find((c) => c.name === name);
    if (!column) throw new TailsiftError("unknown_column", `--decide: column '${name}' is not a profiled categorical column`);
    const was = column.recommendation;
    const rec: Recommendation = {
      encoding,
      params: paramsFor(column, encoding, policy),
      reasons: [`Chosen by the user with --decide ${name}=${encoding}; the rules advised ${was.encoding}:`, ...was.reasons.map((r) => `(advised) ${r}`)],
      ...(was.cautions ? { cautions: was.cautions } : {}),
      overridden: { from: was.encoding, by: "--decide" },
    };
    column.recommendation = rec;
  }
}
