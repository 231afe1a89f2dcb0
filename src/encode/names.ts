/**
 * encode/names: the raw names of the columns encode writes. An encoded column keeps its name;
 * one-hot writes `column=level` per level (encode/encodings/oneHot); pooled one-hot adds
 * `column=other`; `--keep-original` writes the text as `column__text`. Safe names are derived
 * from these (encode/safeNames).
 */
import { TailsiftError } from "../errors.js";

/** Suffix of the text copy written by --keep-original. */
export const TEXT_SUFFIX = "__text";

export const textName = (column: string): string => `${column}${TEXT_SUFFIX}`;

/**
 * The label of pooled one-hot's "other" column. When a kept level has the same text as the label
 * (a level literally called "other"), underscores are appended until it is unique, so the
 * level's own column and the pooled column never share a name.
 */
export function pooledLabel(keep: readonly string[], other: string): string {
  let label = other;
  while (keep.includes(label)) label = `${label}_`;
  return label;
}

/**
 * Refuses an output with two columns of one name (e.g. an input column called `fold` in
 * training mode, or `colour=red` next to a one-hot of `colour`).
 * @throws TailsiftError `name_clash` naming the first repeated name.
 */
export function checkUniqueNames(names: readonly string[], foldColumn: string | undefined): void {
  const seen = new Set<string>();
  for (const n of names) {
    if (seen.has(n)) {
      const hint = n === foldColumn ? "; choose another name with --fold-column" : "; rename the input column or leave it out of --keep";
      throw new TailsiftError("name_clash", `the output would have two columns named '${n}'${hint}`);
    }
    seen.add(n);
  }
}
