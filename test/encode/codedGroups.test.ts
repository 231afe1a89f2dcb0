/**
 * Codes over backoff groups (issue 14, point 9: a closed vocabulary after backoff is indexed,
 * not hashed) against a row-by-row reference: groups re-derived by hand-coded loops from the
 * training counts (test/encode/hierarchyBruteForce.backoffGroupOf), numbered here by descending
 * training rows, ties by depth then key (byte order), "other" and missing → 0. Seeded 5-digit
 * postcodes under 3-digit districts (test/encode/postcodeData.ts), no target; the plan is a real
 * `scan --out` of the training file.
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runCli } from "../../src/cli.js";
import { withEngine } from "../../src/engine/db.js";
import { cli as run } from "../levels/helpers.js";
import { quoteLiteral } from "../../src/engine/sql.js";
import { validateProfile } from "../../src/profile/schema.js";
import { formatCount } from "../../src/render/format.js";
import type { EncodeSummary } from "../../src/encode/types.js";
import type { Profile } from "../../src/profile/types.js";
import { collector, tempDir, writeFile } from "../helpers/tmp.js";
import { splitGroup } from "./hashedGroupsReference.js";
import { backoffGroupOf, type GroupOf } from "./hierarchyBruteForce.js";
import { column, parseCsv, type Cell } from "./helpers.js";
import { groupCounts, readRows } from "./hierarchyHelpers.js";
import { postcodeData } from "./postcodeData.js";

const dir = tempDir("encode-codegroups");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const trainFile = writeFile(dir, "train.csv", postcodeData(1500, 7, false));
const laterFile = writeFile(dir, "later.csv", postcodeData(600, 8, true));
const train = column(parseCsv(fs.readFileSync(trainFile, "utf8")), "postcode");
const later = column(parseCsv(fs.readFileSync(laterFile, "utf8")), "postcode");
const planDir = path.join(dir, "plan");
let params: Record<string, unknown>;
let groupOf: GroupOf;
let codeOf: (level: Cell) => number;

async function cli(argv: string[]): Promise<string> {
  const c = collector();
  const code = await runCli(argv, c.io);
  if (code !== 0) throw new Error(`exit ${code}: ${c.err}`);
  return c.out;
}

function rowsPerCode(codes: readonly Cell[]): Map<string, number> {
  const out = new Map<string, number>();
  for (const c of codes) if (c !== null) out.set(c, (out.get(c) ?? 0) + 1);
  return out;
}

async function encodeRows(file: string, mode: "training" | "scoring", name: string) {
  const out = path.join(dir, `${name}.parquet`);
  const json = await cli(["encode", file, "--plan", planDir, "--out", out, "--for", mode, "--keep", "id", "--format", "json"]);
  return { rows: await readRows(out), summary: JSON.parse(json) as EncodeSummary };
}

beforeAll(async () => {
  await cli(["scan", trainFile, "--out", planDir, "--as-categorical", "postcode", "--quiet"]);
  const profile = JSON.parse(fs.readFileSync(path.join(planDir, "profile.json"), "utf8")) as Profile;
  const rec = profile.columns.find((c) => c.name === "postcode")!.recommendation;
  expect(rec.encoding).toBe("codes");
  expect(rec.params.grouping).toBe("backoff");
  params = rec.params;
  const parents = params.parents as { kind: string; length: number }[];
  groupOf = backoffGroupOf(rowsPerCode(train), parents.map((p) => p.length).reverse(), params.minRows as number);
  // the reference numbering: group rows over the training file, descending, ties by depth then key
  const groupRows = new Map<string, number>();
  for (const l of train) if (l !== null && splitGroup(groupOf(l)).depth >= 0) groupRows.set(groupOf(l), (groupRows.get(groupOf(l)) ?? 0) + 1);
  const order = [...groupRows].sort((a, b) => {
    const ga = splitGroup(a[0]), gb = splitGroup(b[0]);
    return b[1] - a[1] || ga.depth - gb.depth || Buffer.compare(Buffer.from(ga.key), Buffer.from(gb.key));
  });
  const codes = new Map(order.map(([g], k) => [g, k + 1]));
  codeOf = (l) => (l === null ? 0 : codes.get(groupOf(l)) ?? 0);
});

describe("codes over backoff groups", () => {
  it("scan indexes the groups: tableSize = the number of groups, no width", () => {
    const depths = new Set([...rowsPerCode(train).keys()].map((l) => splitGroup(groupOf(l)).depth));
    expect([depths.has(0), [...depths].some((d) => d > 0), depths.has(-1)]).toEqual([true, true, true]);
    const groups = new Set([...rowsPerCode(train).keys()].map((l) => groupOf(l)).filter((g) => splitGroup(g).depth >= 0));
    expect(params.tableSize).toBe(groups.size);
    expect(params.width).toBeUndefined();
  });

  it("training and scoring the scanned file: every row's code as the reference numbers it", async () => {
    const trained = await encodeRows(trainFile, "training", "train-training");
    const expected = train.map(codeOf);
    expect(trained.rows.map((r) => Number(r.postcode))).toEqual(expected);
    const scored = await encodeRows(trainFile, "scoring", "train-scoring");
    expect(scored.rows.map((r) => Number(r.postcode))).toEqual(expected);
    const c = trained.summary.columns[0]!;
    expect(c).toMatchObject({ column: "postcode", encoding: "codes", missing: train.filter((l) => l === null).length, unseen: 0 });
    expect(c.grouping).toEqual({ kind: "backoff", ...groupCounts(train, groupOf, new Set(train)) });
  });

  it("a later file: unseen codes take their parent group's code, an unseen district and missing → 0", async () => {
    const scored = await encodeRows(laterFile, "scoring", "later-scoring");
    const expected = later.map(codeOf);
    expect(scored.rows.map((r) => Number(r.postcode))).toEqual(expected);
    expect(expected[later.findIndex((l) => l?.startsWith("444"))]).toBe(0);
    const seen = new Set(train);
    expect(later.filter((l) => l !== null && !seen.has(l) && splitGroup(groupOf(l)).depth > 0).length).toBeGreaterThan(0);
    expect(scored.summary.columns[0]!.grouping).toEqual({ kind: "backoff", ...groupCounts(later, groupOf, seen) });
  });

  it("the params are typed in the schema: a grouped codes plan without parents is refused on read (one line, exit 2)", async () => {
    const broken = path.join(dir, "plan-no-parents");
    fs.cpSync(planDir, broken, { recursive: true });
    const file = path.join(broken, "profile.json");
    const p = JSON.parse(fs.readFileSync(file, "utf8")) as Profile;
    expect(() => validateProfile(p)).not.toThrow();
    const col = p.columns.find((c) => c.name === "postcode")!;
    const { parents: _dropped, ...rest } = col.recommendation.params as Record<string, unknown>;
    col.recommendation = { ...col.recommendation, params: rest as never };
    fs.writeFileSync(file, JSON.stringify(p));
    const r = await run(["encode", laterFile, "--plan", broken, "--out", path.join(dir, "never.csv"), "--for", "scoring"]);
    expect(r.code).toBe(2);
    expect(r.err.trim().split("\n")).toHaveLength(1);
    expect(r.err).toMatch(/recommendation\/params must have required property 'parents'/);
    expect(fs.existsSync(path.join(dir, "never.csv"))).toBe(false);
  });

  it("tailsift sql --plan scores the scanned plan: its postcode expression gives encode's codes (DuckDB, ansi)", async () => {
    const r = await run(["sql", "--plan", planDir, "--from", "later_rows", "--inline-max", "100000"]);
    expect(r.code, r.err).toBe(0);
    const scored = await encodeRows(laterFile, "scoring", "later-scoring-sql");
    const rows = await withEngine({ threads: 1 }, async (e) => {
      await e.run(`CREATE TABLE later_rows AS SELECT * FROM read_csv(${quoteLiteral(laterFile)}, all_varchar = true, header = true)`, "loading");
      return e.rows<Record<string, unknown>>(r.out.trim().replace(/;$/, ""), "scoring SQL");
    });
    expect(rows.map((x) => Number(x.postcode))).toEqual(scored.rows.map((x) => Number(x.postcode)));
    expect(rows.map((x) => Number(x.postcode))).toEqual(later.map(codeOf));
  });

  it("the terminal table shows the index: backoff groups and the number of codes", async () => {
    const r = await run(["scan", trainFile, "--format", "table", "--no-progress"]);
    expect(r.code, r.err).toBe(0);
    const line = r.out.split("\n").find((l) => l.includes("postcode"))!;
    expect(line).toContain(`codes`);
    expect(line).toContain(`backoff groups, ${formatCount(params.tableSize as number)} codes`);
  });
});
