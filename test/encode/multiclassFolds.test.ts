/**
 * A multi-class target with time-ordered blocks (--time) and with entity-grouped folds
 * (--fold-by), end to end: scan → encode --for training → report (the HTML again, and the
 * Markdown decision record rendered from the saved profile), and the training
 * values of the per-class target encoding (encode/encodings/targetClasses) recomputed by brute
 * force in plain JavaScript from the raw rows:
 *  - --time: a row of block b gets, per class k, the m-estimate (s_k + m_k·π_k)/(n + m_k)
 *    (Cestnik 1990) over the rows with a target of blocks < b only, π_k the class share of those
 *    rows, the K values renormalised to sum 1 (Zadrozny & Elkan 2002); a missing level, or a level
 *    no earlier block has, takes π; block 0 (no earlier rows) takes the input's overall class
 *    shares (encode/targetMaps foldPriors: "a fold holding every target row falls back to the
 *    overall mean"). The blocks are recounted from the times (quantile_disc cut points: the
 *    ⌈n·j/K⌉-th smallest time; block = number of cuts the time is strictly later than).
 *  - --fold-by owner_id: no owner's rows are in two folds, and each row's values come from the
 *    rows of the OTHER folds only (π_k: the other folds' class shares).
 * Data: the invented three-class visit log (sample-data/visit-outcomes.mjs) with, added here, a
 * visit_time (a permutation of the row index, two rows per minute, so not in file order and with
 * ties) and an owner_id (311 owners, about ten rows each); some clinics and outcomes missing.
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runCli } from "../../src/cli.js";
import type { Profile } from "../../src/profile/types.js";
import { renderDecisionRecord } from "../../src/render/markdown.js";
import { shortenForReading } from "../../src/render/shorten.js";
import { visitOutcomes } from "../fixtures/visitOutcomes.js";
import { collector, tempDir, writeFile } from "../helpers/tmp.js";
import { column, parseCsv, type Csv } from "./helpers.js";

const dir = tempDir("encode-mc-folds");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const base = visitOutcomes(3000, 21);
const N = base.rows.length;
const K = 4;
const CLASSES = ["attended", "cancelled_late", "no_show"];
const start = Date.UTC(2024, 0, 1);
const stamp = (minute: number): string => new Date(start + minute * 60_000).toISOString().slice(0, 16).replace("T", " ");
const header = [...base.header, "visit_time", "owner_id"];
const CLINIC = header.indexOf("clinic"), OUTCOME = header.indexOf("visit_outcome");
// 7919 is prime, so i ↦ 7919·i mod N is a permutation; halving it gives two rows per minute
const rows = base.rows.map((r, i) => [
  ...r.map((v, j) => (j === CLINIC && i % 41 === 3) || (j === OUTCOME && i % 97 === 11) ? "" : v),
  stamp(((i * 7919) % N) >> 1), `O${String((i * 37) % 311).padStart(3, "0")}`,
]);
const file = writeFile(dir, "visits.csv", [header.join(","), ...rows.map((r) => r.join(","))].join("\n") + "\n");
const times = rows.map((r) => r[header.indexOf("visit_time")]!);
const owners = rows.map((r) => r[header.indexOf("owner_id")]!);

async function cli(argv: string[]): Promise<string> {
  const c = collector();
  const code = await runCli(argv, c.io);
  if (code !== 0) throw new Error(`exit ${code}: ${c.err}`);
  return c.out;
}

const estimate = (s: number, n: number, m: number | null, prior: number) => (m === null || n === 0 ? prior : (s + m * prior) / (n + m));
const normalise = (p: number[]) => { const t = p.reduce((a, b) => a + b, 0); return p.map((x) => x / t); };
const input = rows.map((r) => ({ clinic: r[CLINIC] || null, cls: r[OUTCOME] ? CLASSES.indexOf(r[OUTCOME]!) : -1 }));
const shares = (of: { cls: number }[]): number[] => CLASSES.map((_, k) => of.filter((o) => o.cls === k).length / of.length);

/**
 * Brute force of one row's K values from the rows `fit` (already restricted to those the row may
 * learn from); `fallback`: the class shares when `fit` has no row with a target.
 */
function classValues(row: { clinic: string | null }, fit: { clinic: string | null; cls: number }[], weights: (number | null)[], fallback: number[]): number[] {
  const labelled = fit.filter((o) => o.cls >= 0);
  if (labelled.length === 0) return fallback;
  const pi = shares(labelled);
  const same = labelled.filter((o) => row.clinic !== null && o.clinic === row.clinic);
  if (same.length === 0) return pi;
  return normalise(CLASSES.map((_, k) => estimate(same.filter((o) => o.cls === k).length, same.length, weights[k]!, pi[k]!)));
}

const readProfile = (planDir: string): Profile => JSON.parse(fs.readFileSync(path.join(planDir, "profile.json"), "utf8")) as Profile;
interface Plan { dir: string; profile: Profile; weights: (number | null)[] }
async function scanPlan(name: string, extra: string[]): Promise<Plan> {
  const planDir = path.join(dir, name);
  await cli(["scan", file, "--target", "visit_outcome", "--folds", String(K), "--out", planDir, "--quiet", ...extra]);
  const profile = readProfile(planDir);
  const clinic = profile.columns.find((c) => c.name === "clinic")!;
  if (clinic.recommendation.encoding !== "target-kfold" || !clinic.recommendation.params.classes) throw new Error(`clinic is not target-encoded per class (${clinic.recommendation.encoding})`);
  return { dir: planDir, profile, weights: clinic.recommendation.params.classes.map((c) => c.weight) };
}

/** encode --for training, then report over the plan's profile; returns the encoded CSV and manifest. */
async function trainAndReport(plan: Plan, name: string): Promise<{ csv: Csv; manifest: { folds: Record<string, unknown>; columns: { column: string; params: { classes: { class: string; output: string | null; weight: number | null }[] } }[] }; markdown: string }> {
  const out = path.join(dir, `${name}.csv`);
  await cli(["encode", file, "--plan", plan.dir, "--for", "training", "--all-classes", "--keep", "visit_id,owner_id,visit_time", "--out", out, "--quiet"]);
  const csv = parseCsv(fs.readFileSync(out, "utf8"));
  expect(column(csv, "visit_id")).toEqual(rows.map((r) => r[0]));
  const manifest = JSON.parse(fs.readFileSync(`${out}.mappings/mappings.json`, "utf8"));
  const html = path.join(dir, `${name}-report.html`);
  await cli(["report", path.join(plan.dir, "profile.json"), "--out", html]);
  expect(fs.statSync(html).size).toBeGreaterThan(0);
  expect(fs.readFileSync(html, "utf8")).toContain("<svg");
  // the Markdown record rendered again from the saved profile (as scan --format markdown does), and the one scan wrote
  const markdown = renderDecisionRecord(shortenForReading(readProfile(plan.dir)));
  expect(fs.readFileSync(path.join(plan.dir, "decisions.md"), "utf8")).toBe(markdown);
  // the record names the target's classes with their shares and the per-class weights of clinic
  if (plan.profile.target?.kind !== "multiclass") throw new Error("not a multi-class target");
  expect(plan.profile.target.classes.map((c) => c.value)).toEqual(CLASSES);
  const classShares = plan.profile.target.classes.map((c) => `${c.value.replace(/_/g, "\\_")} ${(100 * c.share).toFixed(1)} %`);
  expect(markdown).toContain(`3 classes: ${classShares.join(", ")}`);
  for (const c of CLASSES) expect(markdown).toMatch(new RegExp(`^\\| ${c.replace(/_/g, "\\\\_")} \\| `, "m"));
  return { csv, manifest, markdown };
}

function expectValues(csv: Csv, expected: number[][]): void {
  const got = CLASSES.map((c) => column(csv, `clinic_${c}`).map(Number));
  expected.forEach((e, i) => CLASSES.forEach((_, k) => expect(got[k]![i]).toBeCloseTo(e[k]!, 12)));
  got[0]!.forEach((_, i) => expect(got[0]![i]! + got[1]![i]! + got[2]![i]!).toBeCloseTo(1, 12));
}

describe("multi-class target × --time (time-ordered blocks)", () => {
  let plan: Plan;
  beforeAll(async () => { plan = await scanPlan("plan-time", ["--time", "visit_time"]); }, 120_000);

  it("scan → encode --for training → report; each row of block b is encoded per class from blocks < b only", async () => {
    const sorted = [...times].sort();
    const cuts = Array.from({ length: K - 1 }, (_, j) => sorted[Math.ceil(N * ((j + 1) / K)) - 1]!);
    const block = times.map((t) => cuts.filter((c) => t > c).length);
    expect(new Set(block).size).toBe(K);
    expect(plan.profile.settings.fold).toMatchObject({ kind: "time-blocks", timeColumn: "visit_time", k: K, boundaries: cuts.map((c) => `${c}:00`) });

    const { csv, manifest, markdown } = await trainAndReport(plan, "train-time");
    expect(markdown).toContain("Folds: time-ordered blocks by visit\\_time");
    expect(markdown).toContain('"kind":"time-blocks"');
    expect(column(csv, "fold").map(Number)).toEqual(block);
    expect(manifest.folds).toMatchObject({ kind: "time-blocks", timeColumn: "visit_time", k: K });
    const entry = manifest.columns.find((c) => c.column === "clinic")!;
    expect(entry.params.classes.map((c) => [c.class, c.weight])).toEqual(CLASSES.map((c, k) => [c, plan.weights[k]]));

    const overall = shares(input.filter((o) => o.cls >= 0));
    const expected = input.map((row, i) => classValues(row, input.filter((_, j) => block[j]! < block[i]!), plan.weights, overall));
    expectValues(csv, expected);
    // the multi-class evidence is scored forward with these same past-only predictions: per block
    // b ≥ 1 the mean over its rows with a target of −ln q(true class), then the mean over the steps
    const stepLoss = (predict: (i: number) => number[]) => Array.from({ length: K - 1 }, (_, s) => s + 1).map((b) => {
      const scored = input.map((o, i) => ({ o, i })).filter(({ o, i }) => block[i] === b && o.cls >= 0);
      return scored.reduce((t, { o, i }) => t - Math.log(Math.min(1 - 1e-15, Math.max(1e-15, predict(i)[o.cls]!))), 0) / scored.length;
    });
    const mean = (xs: number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;
    const encodedSteps = stepLoss((i) => expected[i]!);
    const sharesSteps = stepLoss((i) => shares(input.filter((o, j) => block[j]! < block[i]! && o.cls >= 0)));
    const evidence = plan.profile.columns.find((c) => c.name === "clinic")!.multiclassEvidence!;
    expect(evidence.validation).toBe("forward");
    expect(evidence.folds).toBe(K - 1);
    const byName = new Map(evidence.candidates.map((c) => [c.candidate, c]));
    expect(byName.get("target-kfold")!.foldLosses.length).toBe(K - 1);
    byName.get("target-kfold")!.foldLosses.forEach((l, s) => expect(l).toBeCloseTo(encodedSteps[s]!, 10));
    byName.get("class-shares")!.foldLosses.forEach((l, s) => expect(l).toBeCloseTo(sharesSteps[s]!, 10));
    expect(byName.get("target-kfold")!.loss).toBeCloseTo(mean(encodedSteps), 10);
    expect(byName.get("class-shares")!.loss).toBeCloseTo(mean(sharesSteps), 10);
    expect(evidence.reason).toMatch(/forward multi-class log loss \(fitted on earlier time blocks, mean over 3 steps\)/);
    expect(markdown).toContain("Forward multi-class log loss (3 steps over time blocks");
    // block 0 has no past: every block-0 row carries the input's overall class shares
    const first = csv.rows.map((_, i) => i).filter((i) => block[i] === 0);
    for (const [k, c] of CLASSES.entries()) {
      const values = first.map((i) => Number(column(csv, `clinic_${c}`)[i]));
      expect(new Set(values).size).toBe(1);
      expect(values[0]).toBeCloseTo(overall[k]!, 12);
    }
  }, 180_000);
});

describe("multi-class target × --fold-by (entity-grouped folds)", () => {
  let plan: Plan;
  beforeAll(async () => { plan = await scanPlan("plan-owner", ["--fold-by", "owner_id"]); }, 120_000);

  it("scan → encode --for training → report; no owner in two folds; each row encoded per class from the other folds only", async () => {
    expect(plan.profile.settings.fold).toMatchObject({ kind: "grouped", k: K, keyColumns: ["owner_id"] });
    const { csv, manifest, markdown } = await trainAndReport(plan, "train-owner");
    expect(markdown).toContain('"kind":"grouped"');
    expect(manifest.folds).toMatchObject({ kind: "grouped", k: K, identityColumns: ["owner_id"] });
    const folds = column(csv, "fold").map(Number);
    expect(column(csv, "owner_id")).toEqual(owners);
    const seen = new Map<string, Set<number>>();
    owners.forEach((o, i) => seen.set(o, (seen.get(o) ?? new Set()).add(folds[i]!)));
    expect(seen.size).toBe(311);
    expect([...seen.entries()].filter(([, s]) => s.size !== 1)).toEqual([]);
    expect(new Set(folds).size).toBe(K);

    const overall = shares(input.filter((o) => o.cls >= 0));
    const expected = input.map((row, i) => classValues(row, input.filter((_, j) => folds[j] !== folds[i]), plan.weights, overall));
    expectValues(csv, expected);
  }, 180_000);
});
