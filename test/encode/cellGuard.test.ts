/**
 * Spreadsheet formula neutralisation in encode's CSV/TSV output (issue 17, item 5): text cells
 * and header cells that start with = + - @ (or a tab or CR) get a single-quote prefix — common
 * practice (OWASP, "CSV Injection") — plain numbers (a negative number included) stay plain, and
 * --no-cell-guard writes every cell as it is. On the code before this change the cells below
 * were written raw. Source and the characters: docs/references.md "Encode output".
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { withEngine } from "../../src/engine/db.js";
import { isFormulaLike } from "../../src/encode/cellGuard.js";
import { tempDir, writeFile } from "../helpers/tmp.js";
import { ok, scanPlan } from "./helpers.js";

const dir = tempDir("encode-guard");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const planDir = path.join(dir, "plan");
const evil = ["=HYPERLINK(\"http://x\")", "+cmd|' /C calc'!A0", "@SUM(1)", "-2+3", "plain"];
let input = "";

beforeAll(async () => {
  const lines = ["kind,note,=head,amount,y"];
  for (let i = 0; i < 200; i++) {
    const amount = i % 2 === 0 ? `-${i}.5` : `${i}`;
    lines.push([evil[i % evil.length], `-${i % 3}`, `h${i % 4}`, amount, String(i % 3 === 0 ? 1 : 0)].map((v) => (/[",]/.test(v) ? `"${v.replace(/"/g, '""')}"` : v)).join(","));
  }
  input = writeFile(dir, "in.csv", `${lines.join("\n")}\n`);
  await scanPlan(input, planDir, ["--target", "y", "--decide", "kind=one-hot", "--decide", "=head=frequency"]);
});

const readCsv = (file: string) => withEngine({ threads: 1 }, (e) =>
  e.rows<Record<string, string | null>>(`SELECT * FROM read_csv('${file}', all_varchar = true, header = true)`, "read"));

describe("encode guards formula-like CSV cells", () => {
  it("prefixes text and header cells with ', keeps plain numbers plain", async () => {
    const out = path.join(dir, "guarded.csv");
    await ok(["encode", input, "--plan", planDir, "--out", out, "--for", "scoring", "--keep-original", "--keep", "note", "--raw-names", "--quiet"]);
    const rows = await readCsv(out);
    const header = Object.keys(rows[0]!);
    expect(header).toContain("'=head"); // the raw header of a column named =head
    expect(header).toContain("kind=plain");
    expect(rows.map((r) => r.kind__text)).toEqual(rows.map((_, i) => {
      const v = evil[i % evil.length]!;
      return v === "plain" ? v : `'${v}`;
    }));
    expect(rows.map((r) => r.note)).toEqual(rows.map((_, i) => `-${i % 3}`)); // a negative number is not a formula
    expect(rows.map((r) => r.amount)).toEqual(rows.map((_, i) => (i % 2 === 0 ? `-${i}.5` : `${i}`)));
    for (const r of rows) for (const v of Object.values(r)) if (v !== null) expect(isFormulaLike(v), v).toBe(false);
  });

  it("--no-cell-guard writes the cells as they are", async () => {
    const out = path.join(dir, "raw.csv");
    await ok(["encode", input, "--plan", planDir, "--out", out, "--for", "scoring", "--keep-original", "--raw-names", "--no-cell-guard", "--quiet"]);
    const rows = await readCsv(out);
    expect(Object.keys(rows[0]!)).toContain("=head");
    expect(rows.map((r) => r.kind__text)).toEqual(rows.map((_, i) => evil[i % evil.length]));
  });

  it("Parquet output is typed and never prefixed", async () => {
    const out = path.join(dir, "typed.parquet");
    await ok(["encode", input, "--plan", planDir, "--out", out, "--for", "scoring", "--keep-original", "--quiet"]);
    const rows = await withEngine({ threads: 1 }, (e) => e.rows<{ t: string }>(`SELECT kind__text AS t FROM read_parquet('${out}')`, "read"));
    expect(rows.map((r) => r.t)).toEqual(rows.map((_, i) => evil[i % evil.length]));
  });
});
