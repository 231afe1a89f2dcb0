/**
 * Typed, safely named model-ready output (issue 16, items 1 and 2), on the sample extract:
 * DuckDB's DESCRIBE of encode's Parquet output shows numeric pass-through columns as BIGINT or
 * DOUBLE (from the scan's numeric detection recorded as `numberType`), the binary target as a
 * 0/1 INTEGER and the fold as INTEGER, while --keep-original copies stay VARCHAR. Every name is
 * [A-Za-z0-9_] and unique, and the manifest and the summary map each name to (column, level).
 * On the code before this change every pass-through column was VARCHAR and one-hot names were
 * `clinic=Yarrowby Vets 24`. Why BIGINT/DOUBLE for the sample's columns: docs/references.md
 * "Encode output" (the generator's column types).
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { encode } from "../../src/commands/encode.js";
import { withEngine } from "../../src/engine/db.js";
import { renderEncodeSummary } from "../../src/encode/summaryTable.js";
import type { OutputColumn } from "../../src/encode/types.js";
import { collector, tempDir, writeFile } from "../helpers/tmp.js";
import { parseCsv, column, runEncodeCli, scanPlan } from "./helpers.js";

const sample = "sample-data/appointments.csv.gz";
const dir = tempDir("encode-typed");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const planDir = path.join(dir, "plan");

const describeFile = (file: string) => withEngine({ threads: 1 }, (e) =>
  e.rows<{ column_name: string; column_type: string }>(`DESCRIBE SELECT * FROM read_parquet('${file}')`, "describe"));

beforeAll(async () => {
  const profile = await scanPlan(sample, planDir, ["--target", "no_show", "--columns", "clinic,species,lead_time_days,invoice_amount"]);
  const byName = new Map(profile.columns.map((c) => [c.name, c]));
  // lead_time_days holds whole days, invoice_amount pounds and pence (sample-data/generate.mjs)
  expect(byName.get("lead_time_days")?.numberType).toBe("integer");
  expect(byName.get("invoice_amount")?.numberType).toBe("double");
}, 300_000);

describe("encode writes typed columns with safe names", () => {
  it("Parquet: numbers BIGINT/DOUBLE, the binary target 0/1 INTEGER, fold INTEGER, text copies VARCHAR", async () => {
    const out = path.join(dir, "train.parquet");
    const summary = await encode([sample], { plan: planDir, out, mode: "training", keepOriginal: true });
    const types = new Map((await describeFile(out)).map((r) => [r.column_name, r.column_type]));
    expect(types.get("lead_time_days")).toBe("BIGINT");
    expect(types.get("invoice_amount")).toBe("DOUBLE");
    expect(types.get("no_show")).toBe("INTEGER");
    expect(types.get("fold")).toBe("INTEGER");
    expect(types.get("clinic__text")).toBe("VARCHAR");
    expect(types.get("species_dog")).toBe("INTEGER");
    for (const name of types.keys()) expect(name).toMatch(/^[A-Za-z_][A-Za-z0-9_]*$/);
    expect(new Set([...types.keys()].map((n) => n.toLowerCase())).size).toBe(types.size);
    // the values are the input's: the sum of each numeric column, and the target's positives
    const [sums] = await withEngine({ threads: 1 }, (e) => e.rows<Record<string, number>>(
      `SELECT (SELECT sum(lead_time_days) FROM read_parquet('${out}'))::DOUBLE AS a, (SELECT sum(lead_time_days::BIGINT) FROM read_csv('${sample}', all_varchar = true))::DOUBLE AS b,
              (SELECT sum(invoice_amount) FROM read_parquet('${out}')) AS c, (SELECT sum(invoice_amount::DOUBLE) FROM read_csv('${sample}', all_varchar = true)) AS d,
              (SELECT sum(no_show) FROM read_parquet('${out}'))::DOUBLE AS e, (SELECT count(*) FILTER (WHERE no_show = '1') FROM read_csv('${sample}', all_varchar = true))::DOUBLE AS f`, "sums"));
    expect(sums!.a).toBe(sums!.b);
    expect(sums!.c).toBeCloseTo(sums!.d!, 6);
    expect(sums!.e).toBe(sums!.f);
    // the map from output name to (column, level), in the manifest and the summary
    const manifest = JSON.parse(fs.readFileSync(path.join(`${out}.mappings`, "mappings.json"), "utf8")) as { output: { columns: string[]; names: string; map: OutputColumn[] }; target: { output: { name: string; type: string } } };
    expect(manifest.output.names).toBe("safe");
    expect(manifest.output.columns).toEqual([...types.keys()]);
    expect(manifest.output.map).toEqual(summary.outputColumns);
    expect(manifest.output.map).toContainEqual({ name: "clinic_Yarrowby_Vets_24", rawName: "clinic=Yarrowby Vets 24", column: "clinic", kind: "encoded", level: "Yarrowby Vets 24", type: "INTEGER" });
    expect(manifest.output.map).toContainEqual({ name: "species_dog", rawName: "species=dog", column: "species", kind: "encoded", level: "dog", type: "INTEGER" });
    expect(manifest.target.output).toMatchObject({ name: "no_show", type: "INTEGER" });
    for (const m of manifest.output.map) expect(types.get(m.name), m.name).toBe(m.type);
    expect(renderEncodeSummary(summary)).toMatch(/\nsafe names: [\d,]+ output columns renamed, e\.g\. 'clinic=[^']+' → 'clinic_[A-Za-z0-9_]+'; the map is in mappings\.json \(output\.map\)\n/);
  }, 300_000);

  it("CSV keeps plain numbers: the input's number text, unchanged", async () => {
    const out = path.join(dir, "score.csv");
    await encode([sample], { plan: planDir, out, mode: "scoring" });
    const enc = parseCsv(fs.readFileSync(out, "utf8"));
    const src = await withEngine({ threads: 1 }, (e) => e.rows<{ l: string; a: string }>(`SELECT lead_time_days AS l, invoice_amount AS a FROM read_csv('${sample}', all_varchar = true)`, "read"));
    expect(column(enc, "lead_time_days")).toEqual(src.map((r) => r.l));
    expect(column(enc, "invoice_amount")).toEqual(src.map((r) => r.a));
  }, 300_000);

  it("--raw-names keeps today's names", async () => {
    const out = path.join(dir, "raw.parquet");
    const summary = await encode([sample], { plan: planDir, out, mode: "scoring", rawNames: true });
    expect(summary.names).toBe("raw");
    const names = (await describeFile(out)).map((r) => r.column_name);
    expect(names).toContain("clinic=Yarrowby Vets 24");
  }, 300_000);

  it("a value that does not fit the planned number type stops with one line naming column and value", async () => {
    const text = "clinic,species,lead_time_days,no_show,invoice_amount\nA,dog,3,0,1.5\nB,cat,2.5,1,2\n";
    const bad = writeFile(dir, "bad.csv", text);
    const c = collector();
    const code = await runEncodeCli(["encode", bad, "--plan", planDir, "--out", path.join(dir, "bad.parquet"), "--for", "scoring", "--quiet"], c.io);
    expect(code).toBe(2);
    expect(c.err).toMatch(/^tailsift: column 'lead_time_days' is an integer in the plan .* holds '2\.5'; .*--keep lead_time_days/);
    expect(c.err.trim().split("\n")).toHaveLength(1);
    expect(fs.existsSync(path.join(dir, "bad.parquet"))).toBe(false);
  }, 300_000);
});
