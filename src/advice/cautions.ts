import type { ColumnProfile, Recommendation } from "../profile/types.js";

/**
 * Column names that suggest location or demographic content. A match is a prompt for review, not
 * a finding: encodings of such columns can act as proxies for protected characteristics.
 */
const SENSITIVE = /(post|zip|postal|address|street|city|town|region|district|country|county|lat|lon|geo|age|birth|dob|gender|sex|ethnic|race|religio|nation|language|marital|disab)/i;

export function cautionsFor(column: ColumnProfile, rec: Recommendation): string[] {
  const out: string[] = [];
  if (SENSITIVE.test(column.name) && rec.encoding !== "drop") {
    out.push(`'${column.name}' looks location-like or demographic: its ${rec.encoding} encoding can act as a proxy for protected characteristics. In regulated uses follow local law, regulators and your organisation's review.`);
  }
  if (column.variants && column.variants.groups > 0) {
    out.push(`${column.variants.groups} groups of levels differ only in case or spacing (${(column.variants.rowShare * 100).toFixed(1)} % of rows); consider cleaning them before encoding.`);
  }
  if (column.target && column.target.leakage.inSample !== null && column.target.leakage.outOfFold !== null
    && column.target.leakage.inSample - column.target.leakage.outOfFold > 0.05) {
    out.push(`In-sample and out-of-fold scores differ by ${(column.target.leakage.inSample - column.target.leakage.outOfFold).toFixed(3)}: never fit a mean encoding of this column on the rows it scores.`);
  }
  return out;
}
