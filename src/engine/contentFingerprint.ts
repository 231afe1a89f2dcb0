/**
 * engine/contentFingerprint: an identity of the rows' CONTENT, computed inside the scan's one
 * pass (no extra read): the row count and the sum, modulo 2^64, of a fixed-seed DuckDB hash of
 * each row's full text (every column, in file order). A sum is order-independent (shards and
 * threads may deliver rows in any order) and, unlike XOR, does not cancel duplicate rows; flipping
 * one value of one row changes it unless two 64-bit hashes collide (chance about 2^-64).
 * Written to profile.json as input.contentFingerprint; encode checks it before reusing the plan's
 * level table. The cheap fingerprint (name, size, first/last 64 KiB) stays as a first screen.
 */
import type { Engine } from "./db.js";
import { quoteIdent } from "./sql.js";

/** Seed of the content hash: fixed (not the fold seed), so plans with other seeds compare. */
const CONTENT_SEED = 7_340_071;
const MOD = 2n ** 64n;

/** The per-row hash (UBIGINT) of all `columns`. */
export function contentHashSql(columns: readonly string[]): string {
  return `hash(${CONTENT_SEED}::BIGINT, ${columns.map(quoteIdent).join(", ")})`;
}

/** Formats the fingerprint from the row count and the (partial) sums as decimal text. */
export function formatContentFingerprint(rows: number, sums: readonly (string | null | undefined)[]): string {
  let total = 0n;
  for (const s of sums) if (s !== null && s !== undefined && s !== "") total = (total + BigInt(s)) % MOD;
  return `rows:${rows};sum64:${total.toString(16).padStart(16, "0")}`;
}

/**
 * The content fingerprint of a view by its own read (encode, before reusing a plan's level
 * table: one streaming read, far cheaper than the GROUP BY pass it may save).
 */
export async function contentFingerprintOf(engine: Engine, view: string, columns: readonly string[], doing: string): Promise<string> {
  const [row] = await engine.rows<{ n: number; s: string | null }>(
    `SELECT count(*)::DOUBLE AS n, sum(${contentHashSql(columns)})::VARCHAR AS s FROM ${view}`, doing);
  return formatContentFingerprint(row?.n ?? 0, [row?.s]);
}
