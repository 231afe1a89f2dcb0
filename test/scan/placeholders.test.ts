/**
 * Issue 14, point 4: levels spelled like a missing value are reported beside `missing`, and
 * --missing-like turns given values into missing in scan, encode, drift and sql alike. Counts
 * are checked against a brute-force count over the generated values with the TypeScript twin of
 * the SQL matcher (placeholderEntry), which is itself checked on hand-picked spellings.
 * Invented vet-clinic data. On the old code neither the figure nor the option existed.
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { scan } from "../../src/commands/scan.js";
import { levelSql } from "../../src/commands/sql.js";
import { withEngine } from "../../src/engine/db.js";
import { quoteLiteral } from "../../src/engine/sql.js";
import { PLACEHOLDER_ENTRIES, placeholderEntry, placeholderEntrySql, placeholderMatchSql, placeholderPrefilterSql } from "../../src/profile/placeholders.js";
import { redactProfile } from "../../src/profile/redact.js";
import type { ColumnProfile, Profile } from "../../src/profile/types.js";
import { renderTable } from "../../src/render/table.js";
import { collector, mulberry32, tempDir, writeFile } from "../helpers/tmp.js";
import { ok, runEncodeCli } from "../encode/helpers.js";

const dir = tempDir("placeholders");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

// spellings chosen by hand: [value, the entry it must match or null]
const SPELLINGS: [string, string | null][] = [
  ["Unk", "unk"], ["UNKNOWN", "unknown"], [" unknown ", "unknown"], ["N/A", "n/a"], ["n/a", "n/a"], ["NA", "na"],
  ["None", "none"], ["NULL", "null"], ["-", "-"], ["?", "?"], ["[no title]", "[no …]"], ["(No  Name)", "[no …]"],
  ["<no value>", "[no …]"], ["[Unknown]", "unknown"], ["Untitled", "untitled"], ["#N/A", "#n/a"], ["nan", "nan"],
  ["no", null], ["No", null], ["no title", null], ["Unknownish", null], ["Nala", null], ["Labrador", null], ["[Poodle]", null],
];

describe("placeholderEntry (the list and its matching)", () => {
  it.each(SPELLINGS)("%j → %j", (value, entry) => {
    expect(placeholderEntry(value)).toBe(entry);
  });
  it("agrees with its SQL twin on every spelling", async () => {
    await withEngine({}, async (engine) => {
      for (const [value] of SPELLINGS) {
        const [row] = await engine.rows<{ e: string | null }>(`SELECT ${placeholderEntrySql(quoteLiteral(value))} AS e`, "test");
        expect(row?.e ?? null, value).toBe(placeholderEntry(value));
      }
    });
  });
});

describe("placeholderPrefilterSql (the regex-free condition in front of the matcher)", () => {
  // brute force: every value the matcher accepts must pass the pre-filter, on the hand-picked
  // spellings and on generated ones (case, spaces, tabs, brackets, "[no …]", random text)
  it("lets through every value the matcher accepts, and drops most others", async () => {
    const r = mulberry32(41);
    const ALPHA = ["a", "N", "u", "m", "-", "#", "?", "/", " ", "\t", "[", "]", "(", ")", "<", ">", "{", "}", "x", "Ü", "İ", "ß", "0", "7"];
    const randomCase = (t: string) => [...t].map((ch) => (r() < 0.5 ? ch.toUpperCase() : ch)).join("");
    const pad = () => [" ", "  ", "\t", ""][Math.floor(r() * 4)]!;
    const values = new Set<string>(SPELLINGS.map(([v]) => v));
    for (const e of PLACEHOLDER_ENTRIES) {
      for (let k = 0; k < 20; k++) {
        const t = `${pad()}${randomCase(e.spelling)}${pad()}`;
        values.add(t);
        const [o, c] = [["[", "]"], ["(", ")"], ["<", ">"], ["{", "}"]][k % 4]!;
        values.add(`${pad()}${o}${pad()}${t}${pad()}${c}${pad()}`);
        values.add(`${o}${randomCase("no")} ${randomCase(e.spelling)}${c}`);
      }
    }
    for (let k = 0; k < 3000; k++) values.add(Array.from({ length: 1 + Math.floor(r() * 12) }, () => ALPHA[Math.floor(r() * ALPHA.length)]!).join(""));
    values.add("n".repeat(41));
    const list = [...values];
    await withEngine({}, async (engine) => {
      await engine.run(`CREATE TABLE v AS SELECT unnest([${list.map(quoteLiteral).join(", ")}]) AS level`, "test");
      const [row] = await engine.rows<{ matched: number; missed: number; differ: number; passed: number; total: number }>(
        `SELECT count(*) FILTER (WHERE ${placeholderMatchSql("level")} IS NOT NULL)::DOUBLE AS matched,
                count(*) FILTER (WHERE ${placeholderMatchSql("level")} IS NOT NULL AND NOT ${placeholderPrefilterSql("level")})::DOUBLE AS missed,
                count(*) FILTER (WHERE ${placeholderMatchSql("level")} IS DISTINCT FROM ${placeholderEntrySql("level")})::DOUBLE AS differ,
                count(*) FILTER (WHERE ${placeholderPrefilterSql("level")})::DOUBLE AS passed, count(*)::DOUBLE AS total FROM v`, "test");
      // (not compared with placeholderEntry: SQL trim() keeps tabs, JavaScript's trim() drops them)
      expect(row?.matched).toBeGreaterThan(500);
      expect(row?.missed).toBe(0);
      expect(row?.differ).toBe(0);
      expect(row?.passed).toBeLessThan(row?.total ?? 0);
    });
  }, 60_000);
});

const N = 800;
const rand = mulberry32(14);
const BREEDS = ["Labrador", "Poodle", "Beagle", "Fjord Spaniel", "Unk", "unknown", "N/A", "[no breed]", "-"];
const WEIGHTS = [30, 20, 15, 10, 12, 3, 4, 2, 1];
const pick = () => {
  let u = rand() * WEIGHTS.reduce((a, b) => a + b, 0);
  for (let i = 0; i < BREEDS.length; i++) { u -= WEIGHTS[i]!; if (u <= 0) return BREEDS[i]!; }
  return BREEDS[0]!;
};
const rows = Array.from({ length: N }, (_, i) => [`A${i}`, rand() < 0.05 ? "" : pick(), ["web", "phone", "N/A"][i % 3]!, rand() < 0.2 ? "1" : "0"]);
const file = writeFile(dir, "visits.csv", ["visit,breed,channel,no_show", ...rows.map((r) => r.join(","))].join("\n") + "\n");
const col = (p: Profile, name: string): ColumnProfile => {
  const c = p.columns.find((x) => x.name === name);
  if (!c) throw new Error(`no column ${name}`);
  return c;
};
const breeds = rows.map((r) => r[1]!);
const count = (pred: (v: string) => boolean) => breeds.filter(pred).length;

describe("placeholder levels in the record", () => {
  let profile: Profile;
  it("scans", async () => { profile = await scan([file], { target: "no_show" }); }, 120_000);

  it("counts the rows spelled like missing, beside missing", () => {
    const c = col(profile, "breed");
    const expected = count((v) => v !== "" && placeholderEntry(v) !== null);
    expect(expected).toBeGreaterThan(100);
    expect(c.missing).toBe(count((v) => v === ""));
    expect(c.placeholders?.rows).toBe(expected);
    expect(c.placeholders?.levels).toBe(5);
    expect(c.placeholders?.top[0]).toEqual({ value: "Unk", rows: count((v) => v === "Unk"), entry: "unk" });
    expect(c.placeholders?.top.map((t) => t.entry).sort()).toEqual(["-", "[no …]", "n/a", "unk", "unknown"]);
    const line = renderTable(profile).split("\n").find((l) => l.includes("│ breed")) ?? "";
    expect(line).toContain(`${((expected / N) * 100).toFixed(1)} %`);
  });

  it("redacts the placeholder level values with --redact (the matched list entry stays)", () => {
    const top = col(redactProfile(profile, "test-key"), "breed").placeholders?.top ?? [];
    expect(top.length).toBe(5);
    for (const l of top) expect(l.value).toMatch(/^#[0-9a-f]{12}$/);
    expect(top.map((l) => l.entry).sort()).toEqual(["-", "[no …]", "n/a", "unk", "unknown"]);
  });

  it("--missing-like makes them missing in scan, encode and drift", async () => {
    const plan = path.join(dir, "plan");
    await ok(["scan", file, "--target", "no_show", "--out", plan, "--quiet", "--missing-like", "unk,UNKNOWN, n/a"]);
    const p = JSON.parse(fs.readFileSync(path.join(plan, "profile.json"), "utf8")) as Profile;
    expect(p.settings.missingLike).toEqual(["n/a", "unk", "unknown"]);
    const b = col(p, "breed");
    const asMissing = (v: string) => v === "" || ["unk", "unknown", "n/a"].includes(v.trim().toLowerCase());
    expect(b.missing).toBe(count(asMissing));
    expect(b.placeholders?.rows).toBe(count((v) => v === "[no breed]" || v === "-"));
    expect(col(p, "channel").missing).toBe(rows.filter((r) => r[2] === "N/A").length);
    expect(col(p, "channel").distinct).toBe(2);
    // drift on the same file with the plan's list: nothing unseen, no missing shift
    const { out } = await ok(["drift", file, "--plan", plan, "--format", "json"]);
    const breedDrift = (JSON.parse(out) as { columns: { name: string; unseenShare: number }[] }).columns.find((c) => c.name === "breed");
    expect(breedDrift?.unseenShare).toBe(0);
    // encode: the encoded column treats them as missing (scoring one-hot/other: no 'Unk' level left), and a different list is refused
    const encoded = path.join(dir, "encoded.csv");
    await ok(["encode", file, "--plan", plan, "--for", "scoring", "--out", encoded, "--quiet"]);
    const c = collector();
    const code = await runEncodeCli(["encode", file, "--plan", plan, "--for", "scoring", "--out", path.join(dir, "x.csv"), "--missing-like", "unk"], c.io);
    expect(code).toBe(2);
    expect(c.err).toMatch(/--missing-like unk differs from the plan's \(n\/a,unk,unknown\)/);
    expect(fs.existsSync(path.join(dir, "x.csv"))).toBe(false);
  }, 180_000);

  it("the sql command writes the same missing definition (run here in DuckDB)", async () => {
    const sql = levelSql({ columns: ["breed"], from: "visits", missingLike: ["Unk", "unknown", "n/a"] });
    await withEngine({}, async (engine) => {
      await engine.run(`CREATE TABLE visits AS SELECT * FROM read_csv(${quoteLiteral(file)}, all_varchar = true)`, "test");
      const [row] = await engine.rows<{ missing: number }>(`SELECT sum(rows)::DOUBLE AS missing FROM (${sql}) WHERE level IS NULL`, "test");
      expect(row?.missing).toBe(count((v) => v === "" || ["unk", "unknown", "n/a"].includes(v.trim().toLowerCase())));
    });
  }, 60_000);
});
