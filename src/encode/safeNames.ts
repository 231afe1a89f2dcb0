/**
 * encode/safeNames: the output column names encode writes by default — names every model library
 * and SQL engine accepts unquoted. The rule is exact, because scoring SQL written elsewhere must
 * produce the same names from the same raw names:
 *  1. start from the raw output name (`clinic=Yarrowby Vets 24`, `amount`, `shop__text`, `fold`);
 *  2. replace every run of characters outside [A-Za-z0-9_] by a single `_`;
 *  3. trim leading and trailing `_`; use `col` when nothing is left;
 *  4. prefix `c_` when the name starts with a digit;
 *  5. walking the names in output order, a name already taken — compared case-insensitively —
 *     gets `_2`, `_3`, … (the first suffix whose result is not taken yet); every name written
 *     is taken, suffixed or not.
 * `--raw-names` keeps the raw names (step 1 only).
 */

/** Steps 2–4 for one name: `clinic=Yarrowby Vets 24` → `clinic_Yarrowby_Vets_24`, `=` → `col`, `7up` → `c_7up`. */
export function safeName(raw: string): string {
  const replaced = raw.replace(/[^A-Za-z0-9_]+/g, "_").replace(/^_+|_+$/g, "");
  const name = replaced === "" ? "col" : replaced;
  return /^[0-9]/.test(name) ? `c_${name}` : name;
}

/**
 * The safe names of a whole output, in output order (steps 2–5): unique case-insensitively.
 * Pure: the same raw names always give the same safe names.
 */
export function safeOutputNames(rawNames: readonly string[]): string[] {
  const taken = new Set<string>();
  return rawNames.map((raw) => {
    const base = safeName(raw);
    let name = base;
    for (let k = 2; taken.has(name.toLowerCase()); k++) name = `${base}_${k}`;
    taken.add(name.toLowerCase());
    return name;
  });
}
