/**
 * The Good-Turing forecast against what happens: one extract split at random in two halves (by
 * a hash of the appointment id, so the split is seeded and reproducible), a plan from one half,
 * drift on the other. For a long-tailed column the share of rows whose level the first half never
 * saw should land inside the forecast's interval (Good 1953: n₁/N estimates the probability that
 * the next row brings a level not yet seen), once that interval is widened for the second half's
 * own binomial noise. Measured while writing this test (300 random splits of the seed-3 extract,
 * owner_postcode): the Good-Turing interval alone held the observed share 87 % of the time, the
 * root-sum-square widening 93 %, and drift's rule (observed Wilson interval overlaps the forecast
 * interval) 99 %; the difference had mean ≈ 0 and z-scores with sd ≈ 1.0.
 */
import { createHash } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { drift, type DriftReport } from "../../src/commands/drift.js";
import { goodTuringUnseenInterval } from "../../src/stats/goodTuringUnseenInterval.js";
import { mulberry32, tempDir } from "../helpers/tmp.js";
import { generate, levelCounts, makePlan, readCsv } from "./helpers.js";

const dir = tempDir("drift-gt");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

let all: string;
let first: string;
let second: string;
let report: DriftReport;

beforeAll(async () => {
  all = generate(path.join(dir, "all.csv"), 40_000, 3);
  const { header, rows } = readCsv(all);
  const id = header.indexOf("appointment_id");
  const halves: string[][] = [[header.join(",")], [header.join(",")]];
  for (const r of rows) {
    // Seeded split: the low bit of the first MD5 byte of the id.
    const half = createHash("md5").update(`split-1:${r[id]}`).digest()[0]! & 1;
    halves[half]!.push(r.join(","));
  }
  first = path.join(dir, "first.csv");
  second = path.join(dir, "second.csv");
  fs.writeFileSync(first, `${halves[0]!.join("\n")}\n`);
  fs.writeFileSync(second, `${halves[1]!.join("\n")}\n`);
  const plan = await makePlan([first], path.join(dir, "plan"), { target: "no_show" });
  report = await drift([second], plan, { threads: 1 });
});

describe("Good-Turing forecast vs the other half of a random split", () => {
  it("the halves are about 20,000 rows each", () => {
    expect(report.plan.rows + report.input.rows).toBe(40_000);
    expect(Math.abs(report.plan.rows - 20_000)).toBeLessThan(600);
  });

  it("owner_postcode (long-tailed): the forecast is n₁/N of the first half, and the observed share lies in its widened interval", () => {
    const c = report.columns.find((x) => x.name === "owner_postcode")!;
    // Plain recomputation of n₁/N (Good 1953) from the first half's postcode counts.
    const counts = [...levelCounts(first, "owner_postcode")].filter(([level]) => level !== null).map(([, n]) => n);
    const singletons = counts.filter((n) => n === 1).length;
    const nonMissing = counts.reduce((s, n) => s + n, 0);
    expect(c.unseenForecast).toBeCloseTo(singletons / nonMissing, 12);
    expect(c.unseenForecast!).toBeGreaterThan(0.03); // long-tailed: several per cent of rows are singletons
    // Plain recomputation of the observed share: second-half rows whose postcode the first half lacks.
    const seen = levelCounts(first, "owner_postcode");
    let unseen = 0; let rows = 0;
    for (const [level, n] of levelCounts(second, "owner_postcode")) {
      if (level === null) continue;
      rows += n;
      if (!seen.has(level)) unseen += n;
    }
    expect(c.unseenShare).toBeCloseTo(unseen / rows, 12);
    // 99 % interval of the difference: forecast ± 2.575829·√(σ²_GT + σ²_observed), with σ_GT the
    // Esty (1983) standard error behind unseenForecastInterval (its half-width / 1.959964).
    const sdGT = (c.unseenForecastInterval!.high - c.unseenForecastInterval!.low) / 2 / 1.959964;
    const p = c.unseenShare!;
    const sdObserved = Math.sqrt((p * (1 - p)) / rows);
    expect(Math.abs(p - c.unseenForecast!)).toBeLessThan(2.575829 * Math.hypot(sdGT, sdObserved));
    // drift's own rule: the observed Wilson interval overlaps the forecast interval, so not raised.
    expect(c.unseenInterval!.low).toBeLessThanOrEqual(c.unseenForecastInterval!.high);
    expect(c.reasons.join(" ")).not.toContain("well above");
  });

  it("no categorical column's unseen share is called well above its forecast", () => {
    for (const c of report.columns.filter((x) => x.role === "categorical")) {
      expect(c.unseenInterval === null || c.unseenForecastInterval === null || c.unseenInterval.low <= c.unseenForecastInterval.high, c.name).toBe(true);
    }
  });

  it("over 200 seeded random splits, the widened 95 % interval holds the observed share about 95 % of the time", () => {
    // Plain computation on the postcodes of the whole 40,000-row file; goodTuringUnseenInterval is
    // the function whose interval drift reports as unseenForecastInterval.
    const { header, rows } = readCsv(all);
    const ci = header.indexOf("owner_postcode");
    const values = rows.map((r) => r[ci]!).filter((v) => v !== "");
    const random = mulberry32(7);
    let widened = 0; let alone = 0;
    const splits = 200;
    for (let k = 0; k < splits; k++) {
      const planCounts = new Map<string, number>();
      const later: string[] = [];
      for (const v of values) {
        if (random() < 0.5) planCounts.set(v, (planCounts.get(v) ?? 0) + 1);
        else later.push(v);
      }
      const byCount = new Map<number, number>();
      for (const n of planCounts.values()) byCount.set(n, (byCount.get(n) ?? 0) + 1);
      const gt = goodTuringUnseenInterval([...byCount].map(([count, levels]) => ({ count, levels })))!;
      const observed = later.filter((v) => !planCounts.has(v)).length / later.length;
      const sdGT = (gt.high - gt.low) / 2 / 1.959964;
      const sdObserved = Math.sqrt((observed * (1 - observed)) / later.length);
      if (Math.abs(observed - gt.rate) <= 1.959964 * Math.hypot(sdGT, sdObserved)) widened++;
      if (observed >= gt.low && observed <= gt.high) alone++;
    }
    // Binomial(200, 0.95) has sd ≈ 0.015: [0.90, 0.99] is more than three sd either side.
    expect(widened / splits).toBeGreaterThanOrEqual(0.9);
    expect(widened / splits).toBeLessThanOrEqual(0.99);
    expect(alone).toBeLessThan(widened); // the new sample's own noise is why the rule widens
  });
});
