/**
 * hierarchy/fixedLength: detects fixed-length codes (postcodes, product or diagnosis codes):
 * levels of one length, made of ASCII letters and digits, where every position holds the same
 * class (digit or letter) in nearly every level — "00501" → "DDDDD", "AB12CD" → "LLDDLL".
 * Random hexadecimal or base-36 identifiers mix classes at each position and are not claimed.
 */

/** Share of sampled levels that must follow the pattern (length, alphabet, class per position). */
export const PATTERN_SHARE = 0.95;
export const MAX_CODE_LENGTH = 16;

export interface FixedLengthPattern { length: number; shape: string; matchingShare: number }

/** The class of a character: D digit, L ASCII letter, null otherwise. */
function charClass(ch: string): "D" | "L" | null {
  if (ch >= "0" && ch <= "9") return "D";
  if ((ch >= "A" && ch <= "Z") || (ch >= "a" && ch <= "z")) return "L";
  return null;
}

/**
 * Returns the pattern or null. Edge cases: fewer than 10 sampled levels, a modal length below 2
 * or above MAX_CODE_LENGTH, a position without a dominant class, or all-letter codes that are not
 * upper case (words, not codes) → null. Sharing is checked by the caller (see detectHierarchy).
 */
export function detectFixedLength(levels: readonly string[]): FixedLengthPattern | null {
  if (levels.length < 10) return null;
  const byLength = new Map<number, number>();
  for (const l of levels) byLength.set(l.length, (byLength.get(l.length) ?? 0) + 1);
  const [length] = [...byLength].sort((a, b) => b[1] - a[1] || a[0] - b[0])[0] ?? [0];
  if (length < 2 || length > MAX_CODE_LENGTH) return null;
  const codes = levels.filter((l) => l.length === length && /^[A-Za-z0-9]+$/.test(l));
  if (codes.length < PATTERN_SHARE * levels.length) return null;
  let shape = "";
  for (let i = 0; i < length; i++) {
    let digits = 0;
    let letters = 0;
    for (const code of codes) {
      const c = charClass(code.charAt(i));
      if (c === "D") digits++;
      else if (c === "L") letters++;
    }
    if (digits >= PATTERN_SHARE * codes.length) shape += "D";
    else if (letters >= PATTERN_SHARE * codes.length) shape += "L";
    else return null;
  }
  if (!shape.includes("D") && codes.filter((c) => c === c.toUpperCase()).length < PATTERN_SHARE * codes.length) return null;
  const matching = codes.filter((c) => [...c].every((ch, i) => charClass(ch) === shape.charAt(i))).length;
  if (matching < PATTERN_SHARE * levels.length) return null;
  return { length, shape, matchingShare: matching / levels.length };
}
