/**
 * profile/placeholders: THE list of spellings that stand for a missing value although the field
 * is not empty. Levels matching it are reported beside `missing` (they are still levels: only
 * `--missing-like VALUE,…` turns values into missing, see engine/missingLike).
 *
 * Matching: the value is trimmed, lower-cased and runs of white space become one space; one
 * enclosing pair of brackets — [ ], ( ), < >, { } — is removed. The result must equal an entry,
 * or, when the value was bracketed, start with "no " (the "[no …]" family: "[no title]",
 * "(no name)", "<no value>"). An unbracketed "no" is a real answer and never matches.
 *
 * Each entry names its source; where we know of none it says "common practice".
 */

export interface PlaceholderEntry { spelling: string; source: string }

export const PLACEHOLDER_ENTRIES: readonly PlaceholderEntry[] = [
  { spelling: "na", source: "R's read.table reads the string NA as missing (na.strings = \"NA\", R documentation; from memory)" },
  { spelling: "n/a", source: "pandas read_csv default na_values include 'N/A' and 'n/a' (pandas documentation; from memory)" },
  { spelling: "#n/a", source: "the not-available error value of spreadsheets (NA() in LibreOffice Calc and Excel; from memory)" },
  { spelling: "nan", source: "pandas read_csv default na_values include 'NaN' and 'nan' (pandas documentation; from memory)" },
  { spelling: "null", source: "SQL NULL written out as text; pandas read_csv default na_values include 'NULL' and 'null' (from memory)" },
  { spelling: "none", source: "Python's None written out as text; pandas read_csv default na_values include 'None' (from memory)" },
  { spelling: "?", source: "many UCI Machine Learning Repository data sets write unknown values as '?' (e.g. the Adult data set's documentation; from memory)" },
  { spelling: "unknown", source: "common practice" },
  { spelling: "unk", source: "common practice (abbreviation of unknown)" },
  { spelling: "missing", source: "common practice" },
  { spelling: "not available", source: "common practice (n/a spelled out)" },
  { spelling: "not applicable", source: "common practice (n/a spelled out)" },
  { spelling: "-", source: "common practice (a dash for an empty table cell)" },
  { spelling: "--", source: "common practice (a dash for an empty table cell)" },
  { spelling: "untitled", source: "common practice (the default name of an unnamed item)" },
];

/** The entry name of the bracketed "no …" family. */
export const NO_SOMETHING_ENTRY = "[no …]";
export const NO_SOMETHING_SOURCE = "common practice (bracketed placeholders such as \"[no title]\")";

const BRACKETED = /^[[(<{]\s*(.*?)\s*[\])>}]$/;

/** The entry a level matches ("n/a", "[no …]"…), or null. The SQL twin is placeholderEntrySql. */
export function placeholderEntry(value: string): string | null {
  const norm = value.trim().toLowerCase().replace(/\s+/g, " ");
  const inner = BRACKETED.exec(norm)?.[1] ?? "";
  const stripped = inner !== "" ? inner : norm;
  if (PLACEHOLDER_ENTRIES.some((e) => e.spelling === stripped)) return stripped;
  if (inner.startsWith("no ")) return NO_SOMETHING_ENTRY;
  return null;
}

/** Longest value looked at: placeholders are short, and the regexes then run on few levels only. */
export const PLACEHOLDER_MAX_LENGTH = 40;

/** What a matching value can start with (after trim and lower-casing): an entry's first character or an opening bracket. */
export const PLACEHOLDER_FIRST_CHARS: readonly string[] = [...new Set([...PLACEHOLDER_ENTRIES.map((e) => e.spelling.charAt(0)), "[", "(", "<", "{"])].sort();

/**
 * A cheap necessary condition for the matcher, with no regex: at most PLACEHOLDER_MAX_LENGTH
 * characters, and the first character after trimming leading spaces, lower-cased, in PLACEHOLDER_FIRST_CHARS. (The
 * normalised value starts with that character, or with a space — which matches nothing — and a
 * match either equals an entry or is bracketed.) Identifier-like columns have millions of levels;
 * the regexes then run on the few that pass (test/scan/placeholders checks it lets every match through).
 */
export function placeholderPrefilterSql(level: string): string {
  const list = PLACEHOLDER_FIRST_CHARS.map((c) => `'${c.replaceAll("'", "''")}'`).join(", ");
  // ltrim(…)[1] is left(trim(…), 1) without trimming the right end (half the cost on 1.75M levels); the length test after it
  return `(lower(ltrim(${level})[1]) IN (${list}) AND length(${level}) <= ${PLACEHOLDER_MAX_LENGTH})`;
}

/** The matcher alone, without the pre-filter (exported for tests): the entry or NULL. */
export function placeholderMatchSql(level: string): string {
  const norm = `regexp_replace(lower(trim(${level})), '\\s+', ' ', 'g')`;
  const inner = `regexp_extract(${norm}, '^[\\[(<{]\\s*(.*?)\\s*[\\])>}]$', 1)`;
  const stripped = `(CASE WHEN ${inner} <> '' THEN ${inner} ELSE ${norm} END)`;
  const list = PLACEHOLDER_ENTRIES.map((e) => `'${e.spelling.replaceAll("'", "''")}'`).join(", ");
  return `(CASE WHEN length(${level}) > ${PLACEHOLDER_MAX_LENGTH} THEN NULL WHEN ${stripped} IN (${list}) THEN ${stripped}`
    + ` WHEN starts_with(${inner}, 'no ') THEN '${NO_SOMETHING_ENTRY}' END)`;
}

/**
 * SQL for placeholderEntry(level): the matched entry, or NULL (DuckDB regexes, RE2 syntax). The
 * pre-filter is the first branch of the CASE, so the regexes are evaluated only where it holds
 * (a WHERE beside them would not do: DuckDB may evaluate the conjuncts in any order).
 */
export function placeholderEntrySql(level: string): string {
  return `(CASE WHEN NOT ${placeholderPrefilterSql(level)} THEN NULL ELSE ${placeholderMatchSql(level)} END)`;
}
