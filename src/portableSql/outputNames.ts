/**
 * portableSql/outputNames: the ONE place where the scoring SQL names its output columns. Today it
 * returns encode's raw names (`clinic=Yarrowby Vets 24`) so the SQL result equals `encode --for
 * scoring` column for column; when encode switches to safe names (encode/safeNames), this is the
 * function to route through them — every output name of portableSql/scoringSql passes here, in
 * output order, all at once (safe names are de-duplicated across the whole output).
 */
export function scoringOutputNames(raw: readonly string[]): string[] {
  return [...raw];
}
