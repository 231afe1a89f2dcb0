/**
 * render/shorten: level values longer than LONG_VALUE_CHARS are shortened in every human-facing
 * output (decisions.md, report.html, the terminal table) and in profile.json's descriptive lists
 * (topLevels, funnel points, variant examples), with a visible marker giving the full length:
 *   "abc…[shortened: 10,000,000 characters]"
 * A 10 MB value would otherwise be copied whole into each of them. The level table
 * (levels.parquet) and the encoding parameters in profile.json (one-hot levels, pooled keep
 * list), which encode maps by, keep every value whole.
 */
import type { Recommendation } from "../profile/recommendation.js";
import type { ColumnProfile, Profile } from "../profile/types.js";

/** Longest level value shown whole (characters, UTF-16 units). Common practice: a table cell's worth. */
export const LONG_VALUE_CHARS = 200;

/** The value, or its first LONG_VALUE_CHARS characters with the marker; null stays null. */
export function shortenValue<T extends string | null>(value: T): T {
  if (value === null || value.length <= LONG_VALUE_CHARS) return value;
  let head = value.slice(0, LONG_VALUE_CHARS);
  if (/[\uD800-\uDBFF]$/.test(head)) head = head.slice(0, -1); // do not split a surrogate pair
  return `${head}…[shortened: ${value.length.toLocaleString("en-US")} characters]` as T;
}

/** The same parameters with every string (and string in a list) shortened; the shape is unchanged. */
function shortenParams<P extends object>(params: P): P {
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(params)) {
    out[k] = typeof v === "string" ? shortenValue(v) : Array.isArray(v) ? v.map((x) => (typeof x === "string" ? shortenValue(x) : x)) : v;
  }
  return out as P;
}

function shortenColumn(c: ColumnProfile, params: boolean): ColumnProfile {
  const out: ColumnProfile = { ...c, topLevels: c.topLevels.map((l) => ({ ...l, value: shortenValue(l.value) })) };
  if (c.variants) out.variants = { ...c.variants, examples: c.variants.examples.map((g) => g.map(shortenValue)) };
  if (c.target?.funnel) out.target = { ...c.target, funnel: c.target.funnel.map((f) => ({ ...f, value: shortenValue(f.value) })) };
  if (params) out.recommendation = { ...c.recommendation, params: shortenParams(c.recommendation.params) } as Recommendation;
  return out;
}

/** profile.json: descriptive lists shortened; encoding parameters whole (encode reads them). */
export function shortenForRecord(profile: Profile): Profile {
  return { ...profile, columns: profile.columns.map((c) => shortenColumn(c, false)) };
}

/** decisions.md, report.html, the terminal: every level value shortened, parameters included. */
export function shortenForReading(profile: Profile): Profile {
  return { ...profile, columns: profile.columns.map((c) => shortenColumn(c, true)) };
}
