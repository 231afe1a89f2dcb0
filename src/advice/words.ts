/** Number wording shared by advice reasons: shares as percentages, counts with separators. */
export function pct(x: number, digits = 1): string {
  if (!Number.isFinite(x)) return "n/a";
  return `${(x * 100).toFixed(digits)} %`;
}

export function count(n: number): string {
  return Number.isFinite(n) ? Math.round(n).toLocaleString("en-US") : "n/a";
}

export function num(x: number | null | undefined, digits = 3): string {
  return x === null || x === undefined || !Number.isFinite(x) ? "n/a" : x.toFixed(digits);
}
