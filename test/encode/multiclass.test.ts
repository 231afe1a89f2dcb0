/**
 * encode of a multi-class target (encode/encodings/targetClasses) recomputed by brute force from
 * the raw rows: per class k the m-estimate (s_k + m_k·π_k)/(n + m_k) (Cestnik 1990) at the plan's
 * m_k, then the K values renormalised to sum 1 (Zadrozny & Elkan 2002) — in training from the
 * OTHER folds' rows (the fold column encode writes) with π_k the other folds' class share, in
 * scoring from the plan's extract with π_k the plan's class share; missing and unseen levels take
 * π. Default K − 1 columns (the largest class not written), --all-classes all K; safe names.
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runCli } from "../../src/cli.js";
import type { Profile } from "../../src/profile/types.js";
import { visitOutcomes } from "../fixtures/visitOutcomes.js";
import { expectCliError } from "../helpers/cliError.js";
import { collector, tempDir, writeFile } from "../helpers/tmp.js";
import { column, parseCsv, type Csv } from "./helpers.js";

const dir = tempDir("encode-mc");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const data = visitOutcomes(6000, 15);
// missing clinics every 41st row, missing outcomes every 97th
const rows = data.rows.map((r, i) => r.map((v, j) => (j === 1 && i % 41 === 3) || (j === 5 && i % 97 === 11) ? "" : v));
const trainFile = writeFile(dir, "train.csv", [data.header.join(","), ...rows.map((r) => r.join(","))].join("\n") + "\n");
const later = visitOutcomes(1500, 4).rows.map((r, i) => (i % 30 === 0 ? [r[0]!, "Clinic 99", ...r.slice(2)] : r));
const scoreFile = writeFile(dir, "later.csv", [data.header.join(","), ...later.map((r) => r.join(","))].join("\n") + "\n");
const planDir = path.join(dir, "plan");
const CLASSES = ["attended", "cancelled_late", "no_show"];

async function cli(argv: string[]): Promise<void> {
  const c = collector();
  const code = await runCli(argv, c.io);
  if (code !== 0) throw new Error(`exit ${code}: ${c.err}`);
}

const estimate = (s: number, n: number, m: number | null, prior: number) => (m === null || n === 0 ? prior : (s + m * prior) / (n + m));
const normalise = (p: number[]) => { const t = p.reduce((a, b) => a + b, 0); return p.map((x) => x / t); };

let profile: Profile;
let weights: (number | null)[];
beforeAll(async () => {
  await cli(["scan", trainFile, "--target", "visit_outcome", "--out", planDir, "--quiet"]);
  profile = JSON.parse(fs.readFileSync(path.join(planDir, "profile.json"), "utf8")) as Profile;
  const clinic = profile.columns.find((c) => c.name === "clinic")!;
  if (clinic.recommendation.encoding !== "target-kfold" || !clinic.recommendation.params.classes) throw new Error("clinic is not target-encoded per class");
  weights = clinic.recommendation.params.classes.map((c) => c.weight);
}, 120_000);

/** Training values by brute force for every input row, from the other folds' rows. */
function trainingExpected(folds: number[]): number[][] {
  const input = rows.map((r, i) => ({ clinic: r[1] || null, cls: r[5] ? CLASSES.indexOf(r[5]) : -1, fold: folds[i]! }));
  return input.map((row) => {
    const other = input.filter((o) => o.fold !== row.fold && o.cls >= 0);
    const pi = CLASSES.map((_, k) => other.filter((o) => o.cls === k).length / other.length);
    if (row.clinic === null) return pi;
    const same = other.filter((o) => o.clinic === row.clinic);
    return normalise(CLASSES.map((_, k) => estimate(same.filter((o) => o.cls === k).length, same.length, weights[k]!, pi[k]!)));
  });
}

function expectColumns(out: Csv, expected: number[][], written: number[]): void {
  for (const k of written) {
    const got = column(out, `clinic_${CLASSES[k]}`).map(Number);
    got.forEach((v, i) => expect(v).toBeCloseTo(expected[i]![k]!, 12));
  }
}

describe("encode --for training, multi-class", () => {
  it.each([["from the plan's level table", []], ["from a recount of the input", ["--recount"]]])("K − 1 columns %s equal the brute force; the dropped class is the largest, stated", async (_how, extra) => {
    const out = path.join(dir, `train-${extra.length}.csv`);
    await cli(["encode", trainFile, "--plan", planDir, "--for", "training", "--out", out, "--quiet", ...extra]);
    const csv = parseCsv(fs.readFileSync(out, "utf8"));
    expect(csv.header.filter((h) => h.startsWith("clinic_"))).toEqual(["clinic_cancelled_late", "clinic_no_show"]);
    expect(csv.header.every((h) => /^[A-Za-z0-9_]+$/.test(h))).toBe(true);
    const folds = column(csv, "fold").map(Number);
    const expected = trainingExpected(folds);
    expectColumns(csv, expected, [1, 2]);
    const manifest = JSON.parse(fs.readFileSync(`${out}.mappings/mappings.json`, "utf8"));
    const entry = manifest.columns.find((c: { column: string }) => c.column === "clinic");
    expect(entry.params.dropped).toBe("attended");
    expect(entry.params.classes.map((c: { class: string; output: string | null; weight: number | null }) => [c.class, c.output, c.weight]))
      .toEqual([["attended", null, weights[0]], ["cancelled_late", "clinic_cancelled_late", weights[1]], ["no_show", "clinic_no_show", weights[2]]]);
    expect(column(csv, "visit_outcome").slice(0, 5)).toEqual(rows.slice(0, 5).map((r) => r[5] || null));
  }, 120_000);
});

describe("encode --for scoring, multi-class", () => {
  it("--all-classes: K columns from the plan's extract, unseen clinics get the class shares, each row sums to 1", async () => {
    const out = path.join(dir, "score.csv");
    await cli(["encode", scoreFile, "--plan", planDir, "--for", "scoring", "--all-classes", "--out", out, "--quiet"]);
    const csv = parseCsv(fs.readFileSync(out, "utf8"));
    expect(csv.header.filter((h) => h.startsWith("clinic_"))).toEqual(CLASSES.map((c) => `clinic_${c}`));
    if (profile.target?.kind !== "multiclass") throw new Error("not multiclass");
    const shares = profile.target.classes.map((c) => c.share);
    const train = rows.filter((r) => r[5] !== "").map((r) => ({ clinic: r[1] || null, cls: CLASSES.indexOf(r[5]!) }));
    const expected = later.map((r) => {
      const same = train.filter((o) => o.clinic === r[1]);
      if (same.length === 0) return shares;
      return normalise(CLASSES.map((_, k) => estimate(same.filter((o) => o.cls === k).length, same.length, weights[k]!, shares[k]!)));
    });
    expectColumns(csv, expected, [0, 1, 2]);
    const unseen = later.findIndex((r) => r[1] === "Clinic 99");
    expect(CLASSES.map((c) => Number(column(csv, `clinic_${c}`)[unseen]))).toEqual(shares.map((s) => expect.closeTo(s, 12)));
    for (let i = 0; i < 50; i++) expect(CLASSES.reduce((a, c) => a + Number(column(csv, `clinic_${c}`)[i]), 0)).toBeCloseTo(1, 12);
  }, 120_000);

  it("--leave-one-out is refused for a multi-class plan: one line, exit 2", async () => {
    await expectCliError(["encode", trainFile, "--plan", planDir, "--for", "training", "--leave-one-out", "--out", path.join(dir, "loo.csv")],
      "bad_option", /^--leave-one-out has no multi-class form/);
    expect(fs.existsSync(path.join(dir, "loo.csv"))).toBe(false);
  });

  it("tailsift sql --plan refuses the multi-class target encoding in one line (encode --for scoring writes it)", async () => {
    await expectCliError(["sql", "--plan", planDir, "--from", "visits"], "unsupported_plan", /^sql --plan cannot yet write the multi-class target encoding of 'clinic'; use encode --for scoring/);
  });
});
