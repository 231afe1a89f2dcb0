/**
 * hierarchy/delimited: detects composite keys whose tokens are joined by delimiters (- / . @ : _
 * space), e.g. "A-B@7" or "north/clinic-3". The delimiter sequence ("signature") must be the same
 * in nearly every sampled level and every token must be letters or digits. Free text is not
 * claimed: varying word counts fail the signature test, and space-only keys whose tokens are
 * mostly words ("Golden Retriever") are treated as text.
 */
import { DELIMITERS } from "./types.js";

export const SIGNATURE_SHARE = 0.9;
export const MAX_TOKENS = 9;

export interface DelimitedPattern { signature: string; delimiters: string; tokens: number; matchingShare: number }

const WORD = /^[A-Za-z][a-z]{2,}$/;

/** The delimiters of a level, in order ("A-B@7" → "-@"). */
export function signatureOf(level: string): string {
  return [...level].filter((ch) => DELIMITERS.includes(ch)).join("");
}

/** The tokens of a level split on the given delimiters. */
export function tokensOf(level: string, delimiters: string): string[] {
  const out: string[] = [];
  let token = "";
  for (const ch of level) {
    if (delimiters.includes(ch)) { out.push(token); token = ""; } else token += ch;
  }
  out.push(token);
  return out;
}

/**
 * Returns the pattern or null. Edge cases: fewer than 10 sampled levels, no delimiter in the
 * modal signature, more than MAX_TOKENS tokens, empty or non-alphanumeric tokens in more than
 * 5 % of matching levels, or word-like space-separated text → null.
 */
export function detectDelimited(levels: readonly string[]): DelimitedPattern | null {
  if (levels.length < 10) return null;
  const counts = new Map<string, number>();
  for (const l of levels) { const s = signatureOf(l); counts.set(s, (counts.get(s) ?? 0) + 1); }
  const [signature, count] = [...counts].sort((a, b) => b[1] - a[1] || (a[0] < b[0] ? -1 : 1))[0] ?? ["", 0];
  if (signature === "" || count < SIGNATURE_SHARE * levels.length || signature.length + 1 > MAX_TOKENS) return null;
  const delimiters = [...new Set(signature)].join("");
  const matching = levels.filter((l) => signatureOf(l) === signature);
  const clean = matching.filter((l) => tokensOf(l, delimiters).every((t) => /^[A-Za-z0-9]+$/.test(t)));
  if (clean.length < 0.95 * matching.length) return null;
  if (/^ +$/.test(signature)) {
    const tokens = clean.flatMap((l) => tokensOf(l, delimiters));
    if (tokens.filter((t) => WORD.test(t)).length >= 0.5 * tokens.length) return null;
  }
  return { signature, delimiters, tokens: signature.length + 1, matchingShare: clean.length / levels.length };
}
