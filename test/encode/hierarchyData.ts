/**
 * Seeded small extracts of 5-digit codes (3-digit parent + 2-digit leaf) for the backoff and
 * hierarchical target-encoding tests. The parent carries the signal; leaves are Zipf-sized, so
 * a few leaves are large and most are rare. Parent "860" has two one- or two-row leaves and the
 * only codes starting with "8": with --min-level-rows 10 they pool too few rows at every depth
 * and go to "other". About 5 % of codes and 4 % of targets are missing.
 * `later` draws the same world plus unseen leaves (UNSEEN_LEAVES) under seen parents, an unseen parent
 * "44401" (no code starts with "4": it goes to "other") and more missing codes.
 */
import { mulberry32 } from "../helpers/tmp.js";

const PARENTS = ["120", "125", "310", "318", "540", "720", "905"];
const RARE_PARENT = "860";
/** Leaves never drawn for training (those are multiples of 3): some share a 4-digit prefix with rare training leaves. */
const UNSEEN_LEAVES = ["01", "11", "29", "31", "99"];

function pick(r: () => number, weights: readonly number[]): number {
  const total = weights.reduce((a, b) => a + b, 0);
  let u = r() * total;
  for (let i = 0; i < weights.length; i++) {
    u -= weights[i] ?? 0;
    if (u <= 0) return i;
  }
  return weights.length - 1;
}

/** CSV text: id,code,y with `rows` rows (plus the rare parent's rows in the training file). */
export function codeData(rows: number, seed: number, later: boolean): string {
  const r = mulberry32(seed);
  const rate = new Map(PARENTS.map((p, k) => [p, 0.08 + 0.12 * k]));
  const leaves = Array.from({ length: 12 }, (_, k) => String(k * 3).padStart(2, "0"));
  const leafWeights = leaves.map((_, k) => 1 / (k + 1));
  const out = ["id,code,y"];
  const push = (code: string | null, p: number) => {
    const y = r() < 0.04 ? "" : r() < p ? "1" : "0";
    out.push(`r${String(out.length).padStart(5, "0")},${code ?? ""},${y}`);
  };
  for (let i = 0; i < rows; i++) {
    const parent = PARENTS[pick(r, PARENTS.map((_, k) => 1 / (k + 1)))]!;
    const unseenLeaf = later && r() < 0.08;
    const code = r() < (later ? 0.08 : 0.05) ? null
      : later && r() < 0.03 ? "44401"
        : `${parent}${unseenLeaf ? UNSEEN_LEAVES[Math.floor(r() * UNSEEN_LEAVES.length)] : leaves[pick(r, leafWeights)]}`;
    const leafShift = code !== null && Number(code.slice(3)) % 2 === 0 ? 0.05 : -0.05;
    push(code, (rate.get(parent) ?? 0.3) + leafShift);
  }
  if (!later) for (const code of [`${RARE_PARENT}01`, `${RARE_PARENT}02`, `${RARE_PARENT}02`]) push(code, 0.5);
  return `${out.join("\n")}\n`;
}
