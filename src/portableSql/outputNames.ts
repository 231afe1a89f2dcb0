/**
 * portableSql/outputNames: the ONE place where the scoring SQL names its output columns, with the
 * names `tailsift encode --for scoring` writes: encode/safeNames's safe names by default
 * (`clinic=Yarrowby Vets 24` → `clinic_Yarrowby_Vets_24`), the raw names with `--raw-names`
 * (both commands take it). Every output name of portableSql/scoringSql passes here, in output
 * order, all at once: safe names are de-duplicated across the whole output, as encode does
 * (encode/outputColumns).
 */
import { safeOutputNames } from "../encode/safeNames.js";

export function scoringOutputNames(raw: readonly string[], rawNames: boolean): string[] {
  return rawNames ? [...raw] : safeOutputNames(raw);
}
