/**
 * Issue 14, point 2: a numeric column with (nearly) one value per row is an identifier, dropped
 * with a reason carrying the exact counts; encode --keep still passes it through. The counts are
 * checked against a brute-force recount of the generated values. Invented vet-clinic data.
 * On the old code such a column had role numeric and was kept.
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { scan } from "../../src/commands/scan.js";
import type { ColumnProfile, Profile } from "../../src/profile/types.js";
import { mulberry32, tempDir, writeFile } from "../helpers/tmp.js";
import { ok, parseCsv, column as csvColumn } from "../encode/helpers.js";

const dir = tempDir("numid");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

const N = 1000;
const rand = mulberry32(77);
// visit_id: 1000 distinct integers in shuffled order (a row key)
const ids = Array.from({ length: N }, (_, i) => 500_001 + i);
for (let i = N - 1; i > 0; i--) { const j = Math.floor(rand() * (i + 1)); [ids[i], ids[j]] = [ids[j]!, ids[i]!]; }
// invoice_ref: 995 distinct in 1000 rows (99.5 %: still one value per row, allowing a few repeats)
// chip_number: 980 distinct in 1000 rows (98 %: below the 99 % line, a number)
// weight_g: integers with many repeats; fee: unique decimals (a measurement, not a key)
const rows = ids.map((id, i) => [
  String(id), String(900_000 + (i < 10 ? Math.floor(i / 2) : i)), String(70_000 + (i < 40 ? Math.floor(i / 2) : i)),
  String(2000 + Math.floor(rand() * 300) * 10), (10 + i * 0.01 + rand() * 0.001).toFixed(5), rand() < 0.15 ? "1" : "0",
]);
const header = ["visit_id", "invoice_ref", "chip_number", "weight_g", "fee", "no_show"];
const file = writeFile(dir, "visits.csv", [header.join(","), ...rows.map((r) => r.join(","))].join("\n") + "\n");
const distinct = (k: number) => new Set(rows.map((r) => r[k])).size;

const col = (p: Profile, name: string): ColumnProfile => {
  const c = p.columns.find((x) => x.name === name);
  if (!c) throw new Error(`no column ${name}`);
  return c;
};

describe("numeric identifiers", () => {
  let profile: Profile;
  it("scans", async () => { profile = await scan([file], { target: "no_show" }); }, 120_000);

  it("drops a unique integer row key as an identifier, with the exact counts in the reason", () => {
    const c = col(profile, "visit_id");
    expect(distinct(0)).toBe(N);
    expect(c.role).toBe("identifier");
    expect(c.recommendation.encoding).toBe("drop");
    expect(c.numericValues).toMatchObject({ distinct: N, exact: true, integer: true, maxRows: 1 });
    expect(c.recommendation.reasons[0]).toContain(`${N.toLocaleString("en-US")} distinct integers in ${N.toLocaleString("en-US")} non-missing rows (100.0 %`);
  });

  it("calls 99.5 % distinct an identifier and 98 % a number", () => {
    expect(distinct(1)).toBe(995);
    expect(col(profile, "invoice_ref").role).toBe("identifier");
    expect(col(profile, "invoice_ref").numericValues).toMatchObject({ distinct: 995, exact: true, maxRows: 2 });
    expect(distinct(2)).toBe(980);
    const chip = col(profile, "chip_number");
    expect(chip.role).toBe("numeric");
    expect(chip.recommendation.encoding).toBe("keep");
    // below the sample screen (99 % distinct), so it is not counted in the pass: sampled count
    expect(chip.numericValues).toMatchObject({ distinct: 980, exact: false, sampledRows: N });
  });

  it("keeps integer measurements with repeats and unique decimals as numbers", () => {
    expect(col(profile, "weight_g").role).toBe("numeric");
    expect(col(profile, "weight_g").numericValues).toMatchObject({ distinct: distinct(3), exact: false, integer: true });
    expect(col(profile, "fee").role).toBe("numeric");
    expect(col(profile, "fee").numericValues?.integer).toBe(false);
  });

  it("leaves no numeric-identifier rows in the level table (drift and encode read it)", async () => {
    const plan = path.join(dir, "plan");
    await ok(["scan", file, "--target", "no_show", "--out", plan, "--quiet"]);
    const out = path.join(dir, "encoded.csv");
    await ok(["encode", file, "--plan", plan, "--for", "scoring", "--out", out, "--quiet"]);
    expect(parseCsv(fs.readFileSync(out, "utf8")).header).not.toContain("visit_id");
    const kept = path.join(dir, "kept.csv");
    await ok(["encode", file, "--plan", plan, "--for", "scoring", "--out", kept, "--keep", "visit_id", "--quiet"]);
    const input = parseCsv(fs.readFileSync(file, "utf8"));
    expect(csvColumn(parseCsv(fs.readFileSync(kept, "utf8")), "visit_id")).toEqual(csvColumn(input, "visit_id"));
    const { out: report } = await ok(["drift", file, "--plan", plan, "--format", "json"]);
    const names = (JSON.parse(report) as { columns: { name: string }[] }).columns.map((c) => c.name);
    expect(names).not.toContain("visit_id");
  }, 180_000);
});
