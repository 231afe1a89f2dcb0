/**
 * encode --for training with a plan scanned with --time (time-blocks folds): past-only target
 * encodings, checked row by row against a brute-force recount in plain JavaScript on a generated
 * visit log whose referral codes grow over time (test/fixtures/growingVisits.ts). A row of block b
 * gets (Σy + m·p_b)/(n + m) over the rows of blocks < b with the row's level, p_b their mean; a
 * level no earlier block has gets p_b; block 0 (no earlier rows) gets the input's overall mean.
 * Both level sources are checked (the plan's level table, and a fresh pass with --recount); the
 * manifest states the fold kind and the past-only rule; --leave-one-out and rows without a time
 * are refused.
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { encode } from "../../src/commands/encode.js";
import { runCli } from "../../src/cli.js";
import { collector, tempDir, writeFile } from "../helpers/tmp.js";
import { growingVisits } from "../fixtures/growingVisits.js";
import { column, parseCsv } from "./helpers.js";

const dir = tempDir("pastonly");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const data = growingVisits(2500, 41);
const file = writeFile(dir, "visits.csv", data.csv);
const K = 4;
const plan = path.join(dir, "plan");

const times = data.rows.map((r) => r[1]!);
const sorted = [...times].sort();
const cuts = Array.from({ length: K - 1 }, (_, j) => sorted[Math.ceil(sorted.length * ((j + 1) / K)) - 1]!);
const block = times.map((t) => cuts.filter((c) => t > c).length);
const y = data.rows.map((r) => Number(r[5]));

/** Past-only value of every row for column c with weight m (null = ∞). */
function pastOnly(c: number, m: number | null): number[] {
  const overall = y.reduce((s, v) => s + v, 0) / y.length;
  return data.rows.map((r, i) => {
    const b = block[i]!;
    const past = data.rows.map((_, j) => j).filter((j) => block[j]! < b);
    if (past.length === 0) return overall;
    const prior = past.reduce((s, j) => s + y[j]!, 0) / past.length;
    const same = past.filter((j) => data.rows[j]![c] === r[c]);
    if (m === null || same.length === 0) return prior;
    return (same.reduce((s, j) => s + y[j]!, 0) + m * prior) / (same.length + m);
  });
}

describe("past-only training encodings (--time plans)", () => {
  it("encodes each row of block b from blocks < b only, from the plan's level table and from a fresh pass", async () => {
    const c = collector();
    expect(await runCli(["scan", file, "--target", "no_show", "--time", "visit_time", "--folds", String(K), "--out", plan, "--quiet"], c.io)).toBe(0);
    const profile = JSON.parse(fs.readFileSync(path.join(plan, "profile.json"), "utf8"));
    const encoded = ["clinic", "referral"].filter((n) => profile.columns.find((x: { name: string }) => x.name === n).recommendation.encoding === "target-kfold");
    expect(encoded.length).toBeGreaterThan(0);
    for (const recount of [false, true]) {
      const out = path.join(dir, `train-${recount}.csv`);
      const summary = await encode([file], { plan, out, mode: "training", keep: ["visit_id"], recount });
      expect(summary.levelSource).toBe(recount ? "input pass" : "plan level table");
      const csv = parseCsv(fs.readFileSync(out, "utf8"));
      expect(column(csv, "visit_id")).toEqual(data.rows.map((r) => r[0]));
      expect(column(csv, "fold").map(Number)).toEqual(block);
      for (const name of encoded) {
        const rec = profile.columns.find((x: { name: string }) => x.name === name).recommendation;
        expect(rec.params.grouping).toBeUndefined(); // flat target encoding in this scenario
        const expected = pastOnly(data.header.indexOf(name), rec.params.weight);
        const got = column(csv, name).map(Number);
        got.forEach((v, i) => expect(v).toBeCloseTo(expected[i]!, 12));
        // block 0 takes the overall mean: the same value on every block-0 row
        expect(new Set(got.filter((_, i) => block[i] === 0)).size).toBe(1);
      }
      const manifest = JSON.parse(fs.readFileSync(`${out}.mappings/mappings.json`, "utf8"));
      expect(manifest.folds).toMatchObject({ kind: "time-blocks", timeColumn: "visit_time", k: K, boundaries: profile.settings.fold.boundaries });
      expect(manifest.folds.encodings).toMatch(/^past-only: a row of time block b is target-encoded from the rows of blocks 0\.\.b-1 only/);
    }
  });

  it("refuses --leave-one-out and input rows without a time (one line, exit 2)", async () => {
    const c = collector();
    expect(await runCli(["encode", file, "--plan", plan, "--for", "training", "--leave-one-out", "--out", path.join(dir, "loo.csv")], c.io)).toBe(2);
    expect(c.err.trim()).toMatch(/^tailsift: --leave-one-out does not apply to a plan scanned with --time/);
    const gappy = writeFile(dir, "gappy.csv", data.csv.replace(/\n(V5,)[^,]*,/, "\n$1,"));
    const g = collector();
    expect(await runCli(["encode", gappy, "--plan", plan, "--for", "training", "--out", path.join(dir, "gappy-out.csv")], g.io)).toBe(2);
    expect(g.err.trim()).toBe("tailsift: the plan's folds are time blocks of 'visit_time', and 1 rows of the input have no 'visit_time'; filter or fill them first");
    expect(fs.existsSync(path.join(dir, "gappy-out.csv"))).toBe(false);
  });
});
