/**
 * Number formatting shared by the renderers (terminal, Markdown, HTML). Every function accepts
 * null, undefined and non-finite numbers and prints "n/a" for them, so NaN never reaches a user.
 * Output is locale-independent (comma thousands separator, point decimal) so the same profile
 * always renders to the same bytes.
 */

/** What every formatter prints for a missing or non-finite number. */
export const NOT_AVAILABLE = "n/a";

function isNumber(x: number | null | undefined): x is number {
  return typeof x === "number" && Number.isFinite(x);
}

/** Inserts "," every three digits in a string of digits. */
function groupDigits(digits: string): string {
  return digits.replace(/\B(?=(\d{3})+(?!\d))/g, ",");
}

/**
 * A number with a fixed number of decimals and thousands separators: 12345.678 → "12,345.68".
 * `-0.00` prints as "0.00". Missing or non-finite → "n/a".
 */
export function formatNumber(x: number | null | undefined, digits = 2): string {
  if (!isNumber(x)) return NOT_AVAILABLE;
  const fixed = Math.abs(x).toFixed(digits);
  const [whole = "0", fraction] = fixed.split(".");
  const body = groupDigits(whole) + (fraction === undefined ? "" : `.${fraction}`);
  const isZero = /^[0.,]*$/.test(body);
  return x < 0 && !isZero ? `-${body}` : body;
}

/**
 * A count with thousands separators: 1234567 → "1,234,567". Non-integers are rounded to the
 * nearest integer (counts are whole numbers; a fraction here is an averaging artefact).
 * Missing or non-finite → "n/a".
 */
export function formatCount(n: number | null | undefined): string {
  if (!isNumber(n)) return NOT_AVAILABLE;
  return formatNumber(Math.round(n), 0);
}

/**
 * A share (a fraction in [0, 1]) as a percentage with `digits` decimals: 0.1234 → "12.3 %".
 * A share that is positive but rounds to zero prints as "< 0.1 %" (likewise "> 99.9 %" near one)
 * so a small non-zero share is never shown as none. Missing or non-finite → "n/a".
 */
export function formatShare(x: number | null | undefined, digits = 1): string {
  if (!isNumber(x)) return NOT_AVAILABLE;
  const step = 10 ** -digits;
  const percent = x * 100;
  if (percent > 0 && percent < step / 2) return `< ${formatNumber(step, digits)} %`;
  if (percent < 100 && percent > 100 - step / 2) return `> ${formatNumber(100 - step, digits)} %`;
  return `${formatNumber(percent, digits)} %`;
}

/**
 * A number with at most `significant` significant digits and no trailing zeros, for parameters
 * and figures of unknown scale: 21.6412 → "21.64", 0.0123456 → "0.01235", 1024 → "1,024".
 * Missing or non-finite → "n/a".
 */
export function formatCompact(x: number | null | undefined, significant = 4): string {
  if (!isNumber(x)) return NOT_AVAILABLE;
  if (Number.isInteger(x)) return formatNumber(x, 0);
  const magnitude = x === 0 ? 0 : Math.floor(Math.log10(Math.abs(x)));
  const digits = Math.min(12, Math.max(0, significant - 1 - magnitude));
  return formatNumber(x, digits).replace(/(\.\d*?)0+$/, "$1").replace(/\.$/, "");
}
