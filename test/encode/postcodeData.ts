/**
 * Seeded small extracts of 5-digit postcodes (3-digit district + 2-digit leaf) for the
 * backoff-then-hashing tests, without a target: the kind of column scan calls identifier-like
 * (most codes seen once) whose codes nest. Districts are Zipf-weighted, so the large ones pool
 * enough rare codes to form a group and the small ones do not; two busy codes (POPULAR) keep
 * their own group; the district "060" has three rows and the only codes starting with "0", so
 * they go to "other" at every depth. About 3 % of codes are missing.
 * `later` draws the same world (its codes mostly unseen: leaves are drawn afresh), plus codes
 * under "444", a district no training code shares even a first digit with (→ "other").
 */
import { mulberry32 } from "../helpers/tmp.js";

/** No district starts with "0" or "4" (see RARE and the later file's "444"). */
const DISTRICTS = ["120", "135", "138", "217", "229", "301", "356", "512", "548", "577", "603", "618", "691",
  "725", "733", "780", "802", "846", "861", "905", "917", "932", "958", "977"];
const POPULAR = ["13517", "60342"];
const RARE = ["06001", "06002", "06002"];

/** CSV text: id,postcode with `rows` drawn rows (plus the rare district's rows in the training file). */
export function postcodeData(rows: number, seed: number, later: boolean): string {
  const r = mulberry32(seed);
  const weights = DISTRICTS.map((_, k) => 1 / (1 + k / 4));
  const total = weights.reduce((a, b) => a + b, 0);
  const district = () => {
    let u = r() * total;
    for (let k = 0; k < DISTRICTS.length; k++) if ((u -= weights[k]!) <= 0) return DISTRICTS[k]!;
    return DISTRICTS[DISTRICTS.length - 1]!;
  };
  const leaf = () => String(Math.floor(r() * 100)).padStart(2, "0");
  const out = ["id,postcode"];
  const push = (code: string | null) => out.push(`p${String(out.length).padStart(5, "0")},${code ?? ""}`);
  for (let i = 0; i < rows; i++) {
    const u = r();
    if (u < 0.03) push(null);
    else if (u < 0.09) push(POPULAR[u < 0.06 ? 0 : 1]!);
    else if (later && u < 0.12) push(`444${leaf()}`);
    else push(`${district()}${leaf()}`);
  }
  if (!later) for (const code of RARE) push(code);
  return `${out.join("\n")}\n`;
}
