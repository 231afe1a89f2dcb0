/**
 * Open data: real files shipped by the npm package vega-datasets, profiled by scan and compared
 * with an independent plain computation (d3-dsv, a general-purpose CSV parser, plus counting in JS).
 */
import fs from "node:fs";
import path from "node:path";
import { csvParse } from "d3-dsv";
import { describe, expect, it } from "vitest";
import { scan } from "../../src/commands/scan.js";

const dataDir = path.join(process.cwd(), "node_modules", "vega-datasets", "data") + path.sep;

function levelCounts(values: readonly (string | undefined)[]): Map<string, number> {
  const counts = new Map<string, number>();
  for (const v of values) if (v !== undefined && v !== "") counts.set(v, (counts.get(v) ?? 0) + 1);
  return counts;
}

function topOf(counts: Map<string, number>, n: number): [string, number][] {
  return [...counts].sort((a, b) => b[1] - a[1] || (a[0] < b[0] ? -1 : a[0] > b[0] ? 1 : 0)).slice(0, n);
}

describe("vega-datasets birdstrikes.csv", () => {
  const file = `${dataDir}birdstrikes.csv`;
  const rows = csvParse(fs.readFileSync(file, "utf8"));

  it("matches an independent count of distinct levels, missing values and top levels per column", async () => {
    const profile = await scan([file], { asCategorical: rows.columns as string[] });
    expect(profile.input.rows).toBe(rows.length);
    for (const name of rows.columns) {
      const counts = levelCounts(rows.map((r) => r[name]));
      const column = profile.columns.find((c) => c.name === name)!;
      expect(column.distinct, name).toBe(counts.size);
      expect(column.missing, name).toBe(rows.filter((r) => r[name] === "" || r[name] === undefined).length);
      expect(column.topLevels.slice(0, 5).map((l) => [l.value, l.rows]), name).toEqual(topOf(counts, 5));
      expect(column.singletons, name).toBe([...counts.values()].filter((c) => c === 1).length);
    }
  });
});

describe("vega-datasets zipcodes.csv (codes with leading zeros)", () => {
  const file = `${dataDir}zipcodes.csv`;
  const rows = csvParse(fs.readFileSync(file, "utf8"));

  it("keeps leading zeros and counts every level exactly", async () => {
    const profile = await scan([file], { columns: ["zip_code", "state"], asCategorical: ["zip_code"] });
    const zip = profile.columns.find((c) => c.name === "zip_code")!;
    const state = profile.columns.find((c) => c.name === "state")!;
    const zipCounts = levelCounts(rows.map((r) => r.zip_code));
    expect(zip.distinct).toBe(zipCounts.size);
    expect([...zipCounts.keys()].some((z) => z.startsWith("0"))).toBe(true);
    expect(zip.role).toBe("identifier");
    const stateCounts = levelCounts(rows.map((r) => r.state));
    expect(state.distinct).toBe(stateCounts.size);
    expect(state.topLevels.slice(0, 3).map((l) => [l.value, l.rows])).toEqual(topOf(stateCounts, 3));
  });
});
