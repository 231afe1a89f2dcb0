/**
 * Time-ordered blocks (--time, engine/folds kind "time-blocks"), checked by brute force on a
 * generated visit log whose level set grows over time (test/fixtures/growingVisits.ts):
 *  - the cut points are the exact discrete quantiles of the time column, recomputed in JavaScript
 *    as the smallest value whose empirical CDF reaches j/k (inverse-CDF definition, Hyndman & Fan
 *    1996 type 1 — the definition DuckDB's quantile_disc follows; recalled from memory);
 *  - every row's block, recounted in JavaScript from its time, equals the fold of foldSql and of
 *    the level table scan writes; blocks are in time order (every time of block b is later than
 *    every time of block b − 1);
 *  - the record states the kind, the plan reads back the same contract, the schema accepts it;
 *  - bad --time values: one line, exit 2, nothing written.
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { runCli } from "../../src/cli.js";
import { scan } from "../../src/commands/scan.js";
import { withEngine } from "../../src/engine/db.js";
import { foldSql, readFoldContract } from "../../src/engine/folds.js";
import { quoteLiteral } from "../../src/engine/sql.js";
import { validateProfile } from "../../src/profile/schema.js";
import { collector, tempDir, writeFile } from "../helpers/tmp.js";
import { growingVisits } from "../fixtures/growingVisits.js";

const dir = tempDir("timeblocks");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const data = growingVisits(3000, 21);
const file = writeFile(dir, "visits.csv", data.csv);

/** The exact discrete quantiles of the times (strings sort as times in this fixed format). */
function cutsByBruteForce(times: string[], k: number): string[] {
  const sorted = [...times].sort();
  return Array.from({ length: k - 1 }, (_, j) => sorted[Math.ceil(sorted.length * ((j + 1) / k)) - 1]!);
}
const blockOf = (t: string, cuts: string[]) => cuts.filter((c) => t > c).length;
const asRecorded = (t: string) => `${t}:00`; // the fixture writes HH:MM; the record writes HH:MM:SS

describe("time-ordered blocks", () => {
  it("cuts at the exact quantiles, blocks in time order, the same fold in foldSql and the level table", async () => {
    const out = path.join(dir, "plan");
    const c = collector();
    expect(await runCli(["scan", file, "--target", "no_show", "--time", "visit_time", "--folds", "4", "--out", out, "--quiet"], c.io)).toBe(0);
    const profile = JSON.parse(fs.readFileSync(path.join(out, "profile.json"), "utf8"));
    expect(() => validateProfile(profile)).not.toThrow();
    const times = data.rows.map((r) => r[1]!);
    const cuts = cutsByBruteForce(times, 4).map(asRecorded);
    expect(profile.settings.fold).toEqual({ kind: "time-blocks", hash: "consecutive-time-blocks", seed: 42, k: 4, keyColumns: ["visit_time"], timeColumn: "visit_time", boundaries: cuts });
    expect(readFoldContract(profile.settings)).toEqual(profile.settings.fold);
    const expected = data.rows.map((r) => blockOf(asRecorded(r[1]!), cuts));
    // each block holds about a quarter of the rows (ties at a cut stay in one block)
    for (let b = 0; b < 4; b += 1) expect(expected.filter((x) => x === b).length).toBeGreaterThan(600);
    const [rowFolds, tableFolds] = await withEngine({ threads: 1 }, async (e) => [
      await e.rows<{ visit_id: string; fold: number }>(`SELECT visit_id, ${foldSql(profile.settings.fold)} AS fold FROM read_csv(${quoteLiteral(file)}, all_varchar = true)`, "row folds"),
      await e.rows<{ level: string; fold: number }>(`SELECT level, fold::INTEGER AS fold FROM read_parquet(${quoteLiteral(path.join(out, "levels.parquet"))}) WHERE "column" = 'visit_id'`, "table folds"),
    ]);
    const byId = new Map(data.rows.map((r, i) => [r[0]!, expected[i]!]));
    expect(rowFolds.length).toBe(data.rows.length);
    for (const r of rowFolds) expect(r.fold).toBe(byId.get(r.visit_id));
    expect(tableFolds.length).toBe(data.rows.length);
    for (const r of tableFolds) expect(r.fold).toBe(byId.get(r.level));
    // time order: the latest time of block b is before the earliest of block b + 1
    for (let b = 0; b < 3; b += 1) {
      const last = times.filter((_, i) => expected[i] === b).sort().at(-1)!;
      const first = times.filter((_, i) => expected[i] === b + 1).sort()[0]!;
      expect(last < first).toBe(true);
    }
    // the record states the fold kind in every renderer
    expect(fs.readFileSync(path.join(out, "decisions.md"), "utf8")).toContain("time-ordered blocks by visit\\_time"); // Markdown escapes _
    expect(fs.readFileSync(path.join(out, "report.html"), "utf8")).toContain("time-ordered blocks by visit_time");
    const t = collector();
    expect(await runCli(["scan", file, "--target", "no_show", "--time", "visit_time"], t.io)).toBe(0);
    expect(t.out.split("\n")[0]).toMatch(/; 5 folds, seed 42 \(time-ordered blocks by visit_time\)$/);
  });

  it("refuses a bad --time with one line and exit 2, and writes nothing", async () => {
    const gappy = writeFile(dir, "gappy.csv", data.csv.replace(/\n(V7,)[^,]*,/, "\n$1,").replace(/\n(V9,)[^,]*,/, "\n$1soon,"));
    const monthly = writeFile(dir, "monthly.csv", data.csv.replace(/,(2025-\d\d)-\d\d \d\d:\d\d,/g, ",$1-01,")); // 12 distinct times
    const cases: [string[], RegExp][] = [
      [[file, "--time", "when"], /^--time: column 'when' not found; columns are: visit_id, visit_time/],
      [[file, "--time", "no_show"], /^--time: 'no_show' is the target; order the rows by a date\/time column$/],
      [[file, "--time", "clinic"], /^--time: 3000 values of 'clinic' do not read as a date\/time \(e\.g\. "C01"\)/],
      [[gappy, "--time", "visit_time"], /^--time: 1 of 3000 rows have no 'visit_time'; time-ordered blocks need a time on every row/],
      [[file, "--time", "visit_time", "--fold-by", "clinic"], /^--time and --fold-by cannot be combined/],
      [[monthly, "--time", "visit_time", "--folds", "20"], /^--time: 'visit_time' has too few distinct times for 20 blocks \(cut points \d+ and \d+ are both 2025-\d\d-01 00:00:00\); use fewer --folds$/],
    ];
    for (const [args, message] of cases) {
      const c = collector();
      const out = path.join(dir, "refused");
      expect(await runCli(["scan", ...args, "--target", "no_show", "--out", out], c.io), args.join(" ")).toBe(2);
      const lines = c.err.trim().split("\n");
      expect(lines.length).toBe(1);
      expect(lines[0]!.replace(/^tailsift: /, "")).toMatch(message);
      expect(fs.existsSync(path.join(out, "profile.json"))).toBe(false);
    }
    // the unreadable value in gappy2 (V9's "soon") is counted once the missing one is filled
    const gappy2 = writeFile(dir, "gappy2.csv", data.csv.replace(/\n(V9,)[^,]*,/, "\n$1soon,"));
    await expect(scan([gappy2], { time: "visit_time" })).rejects.toThrow(/^--time: 1 values of 'visit_time' do not read as a date\/time \(e\.g\. "soon"\)/);
    const c = collector();
    expect(await runCli(["scan", "--levels", path.join(dir, "plan", "levels.parquet"), "--time", "visit_time"], c.io)).toBe(2);
    expect(c.err.trim()).toBe("tailsift: --time does not apply to --levels: level tables are already counted");
  });
});
