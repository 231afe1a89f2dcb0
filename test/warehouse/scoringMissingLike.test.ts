/**
 * A plan scanned with --missing-like reads those values as missing in every column; the scoring
 * SQL (`tailsift sql --plan`) must do the same as `tailsift encode --for scoring` (differential
 * test, encode is the reference), in DuckDB with the ansi dialect: "Unknown" spellings in encoded
 * columns take the missing value, and in the passed-through id column they become NULL — with
 * encode's safe output names and with --raw-names alike.
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { withEngine } from "../../src/engine/db.js";
import { quoteLiteral } from "../../src/engine/sql.js";
import { tempDir } from "../helpers/tmp.js";
import { cli } from "../levels/helpers.js";
import { expectSameRows, loadExtract } from "./data.js";
import { scoringExtract, SCORING_COLUMNS, useEveryEncoding } from "./scoringData.js";

const dir = tempDir("warehouse-missing-like");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const at = (n: string) => path.join(dir, n);

/** The scoring extract with every 9th breed, 11th clinic and 50th id spelled as an unknown (rows without quoted commas). */
function withUnknowns(csv: string): string {
  const [head, ...lines] = csv.trimEnd().split("\n");
  const breed = SCORING_COLUMNS.indexOf("breed");
  const clinic = SCORING_COLUMNS.indexOf("clinic");
  const out = lines.map((l, i) => {
    const cells = l.split(",");
    if (cells.length !== SCORING_COLUMNS.length) return l; // a quoted comma elsewhere in the row: left as it is
    if (i % 9 === 0) cells[breed] = "Unknown";
    if (i % 11 === 0) cells[clinic] = " UNKNOWN ";
    if (i % 50 === 7) cells[0] = "unknown";
    return cells.join(",");
  });
  return `${[head, ...out].join("\n")}\n`;
}

describe("scoring SQL of a --missing-like plan equals encode --for scoring", () => {
  it("the unknown spellings are missing in encoded and passed-through columns alike", async () => {
    fs.writeFileSync(at("train.csv"), withUnknowns(scoringExtract(1200, 3, false)));
    fs.writeFileSync(at("later.csv"), withUnknowns(scoringExtract(500, 4, true)));
    const scan = await cli(["scan", at("train.csv"), "--target", "no_show", "--out", at("plan"), "--as-categorical", "postcode", "--missing-like", "unknown", "--quiet", "--no-progress"]);
    expect(scan.code, scan.err).toBe(0);
    const profile = useEveryEncoding(at("plan"));
    expect(profile.settings.missingLike).toEqual(["unknown"]);
    // the levels were counted without the unknowns
    expect(profile.columns.find((c) => c.name === "breed")!.topLevels.some((l) => l.value?.trim().toLowerCase() === "unknown")).toBe(false);
    // both naming modes: encode's safe names (the default) and --raw-names, given to both commands
    for (const names of [[], ["--raw-names"]]) {
      const out = at(`encoded${names.length}.parquet`);
      const enc = await cli(["encode", at("later.csv"), "--plan", at("plan"), "--out", out, "--for", "scoring", ...names, "--no-progress", "--quiet"]);
      expect(enc.code, enc.err).toBe(0);
      const sql = await cli(["sql", "--plan", at("plan"), "--from", "later", "--inline-max", "100000", ...names]);
      expect(sql.code, sql.err).toBe(0);
      expect(sql.out).toContain("'unknown'");
      await withEngine({ threads: 1 }, async (e) => {
        const file = quoteLiteral(out);
        const expected = await e.rows<Record<string, unknown>>(`SELECT row_number() OVER () - 1 AS __row, * FROM read_parquet(${file})`, "reading encode's output");
        const columns = (await e.rows<{ column_name: string }>(`DESCRIBE SELECT * FROM read_parquet(${file})`, "describe")).map((r) => r.column_name);
        await loadExtract(e, at("later.csv"), "later");
        const actual = await e.rows<Record<string, unknown>>(`SELECT row_number() OVER () - 1 AS __row, * FROM (${sql.out.trim().replace(/;$/, "")})`, "running the scoring SQL");
        expect(columns).toContain("id");
        // the naming mode is the one asked for: some raw name has a character outside [A-Za-z0-9_]
        expect(columns.some((c) => /[^A-Za-z0-9_]/.test(c))).toBe(names.length > 0);
        expect(Object.keys(actual[0]!).filter((k) => k !== "__row")).toEqual(columns);
        // encode wrote NULL for the 'unknown' ids, and so does the SQL
        expect(expected.filter((r) => r.id === null).length).toBeGreaterThan(5);
        expectSameRows(actual, expected, columns, "__row");
      });
    }
  }, 120_000);
});
