/**
 * Issue 14, point 1: date and timestamp columns get the time role, are not counted as levels,
 * and the record carries their exact range (checked against a brute-force min/max over the
 * generated strings), granularity and calendar parts; --as-categorical still wins; encode passes
 * a time column through unchanged. Invented vet-clinic data (seeded).
 * On the old code every one of these columns was profiled as levels (role categorical).
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { scan } from "../../src/commands/scan.js";
import { renderTable } from "../../src/render/table.js";
import type { ColumnProfile, Profile } from "../../src/profile/types.js";
import { mulberry32, tempDir, writeFile } from "../helpers/tmp.js";
import { ok, parseCsv, column as csvColumn } from "../encode/helpers.js";

const dir = tempDir("time");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

const N = 600;
const rand = mulberry32(20250101);
const pad = (n: number, w = 2) => String(n).padStart(w, "0");
const day = (offset: number) => new Date(Date.UTC(2024, 0, 1) + offset * 86_400_000).toISOString().slice(0, 10);
const rows: string[][] = [];
for (let i = 0; i < N; i++) {
  const d = day(Math.floor(rand() * 400));                       // about 13 months of visits
  const visitDate = i % 50 === 7 ? "" : d;                       // 12 missing
  const booked = `${day(Math.floor(rand() * 20))} ${pad(8 + Math.floor(rand() * 10))}:${pad(Math.floor(rand() * 4) * 15)}`; // minutes, 20 days
  const checkIn = `${d}T${pad(8 + Math.floor(rand() * 10))}:${pad(Math.floor(rand() * 60))}:${pad(Math.floor(rand() * 60))}Z`;
  const vaccinated = i % 40 === 3 ? "unknown" : day(Math.floor(rand() * 900)); // 15 of 600 = 2.5 % not dates
  const lastSeen = i % 5 === 0 ? "not recorded" : day(Math.floor(rand() * 100)); // 20 % not dates: levels
  rows.push([`P${pad(i % 37, 3)}`, visitDate, booked, checkIn, vaccinated, lastSeen, rand() < 0.2 ? "1" : "0"]);
}
const header = ["patient", "visit_date", "booked_at", "check_in", "vaccinated_on", "last_seen", "no_show"];
const file = writeFile(dir, "visits.csv", [header.join(","), ...rows.map((r) => r.join(","))].join("\n") + "\n");

const col = (p: Profile, name: string): ColumnProfile => {
  const c = p.columns.find((x) => x.name === name);
  if (!c) throw new Error(`no column ${name}`);
  return c;
};
/** Brute force: ISO strings of one format sort as their times do. */
const range = (k: number, keep: (v: string) => boolean) => {
  const values = rows.map((r) => r[k]!).filter(keep).sort();
  return { min: values[0], max: values[values.length - 1], n: values.length };
};

describe("time role", () => {
  let profile: Profile;
  it("scans", async () => {
    profile = await scan([file], { target: "no_show", asCategorical: ["last_seen"] });
  }, 120_000);

  it("gives dates the time role with the exact range, day granularity and calendar parts", () => {
    const c = col(profile, "visit_date");
    const b = range(1, (v) => v !== "");
    expect(c.role).toBe("time");
    expect(c.recommendation.encoding).toBe("keep");
    expect(c.missing).toBe(N - b.n);
    expect(c.time?.min).toBe(b.min);
    expect(c.time?.max).toBe(b.max);
    expect(c.time?.granularity).toBe("day");
    expect(c.time?.parsedRows).toBe(b.n);
    expect(c.time?.calendarParts).toEqual(["day of week", "month"]);   // ~13 months: no year
    expect(c.topLevels).toEqual([]);                                   // not counted as levels
    expect(c.recommendation.reasons.join(" ")).toContain(`Range ${b.min} to ${b.max}`);
  });

  it("reads 'YYYY-MM-DD HH:MM' at minute granularity and ISO 'T…Z' at second granularity", () => {
    const booked = col(profile, "booked_at");
    const b = range(2, () => true);
    expect(booked.role).toBe("time");
    expect(booked.time?.granularity).toBe("minute");
    expect(booked.time?.min).toBe(`${b.min}:00`);
    expect(booked.time?.max).toBe(`${b.max}:00`);
    expect(booked.time?.calendarParts).toEqual(["hour", "day of week"]); // 20 days: no month
    const checkIn = col(profile, "check_in");
    const c = range(3, () => true);
    expect(checkIn.role).toBe("time");
    expect(checkIn.time?.granularity).toBe("second");
    expect(checkIn.time?.min).toBe(c.min!.replace("T", " ").replace("Z", ""));
    expect(checkIn.time?.max).toBe(c.max!.replace("T", " ").replace("Z", ""));
  });

  it("keeps a date column with a few stray spellings (≥ 95 % dates) and counts the strays", () => {
    const c = col(profile, "vaccinated_on");
    expect(c.role).toBe("time");
    expect(c.time?.unparsedRows).toBe(15);
    expect(c.time?.sampledShare).toBeCloseTo(585 / 600, 10);
    expect(c.time?.calendarParts).toEqual(["day of week", "month", "year"]); // 900 days
  });

  it("lets --as-categorical win, and leaves 80 %-date columns as levels", async () => {
    expect(col(profile, "last_seen").role).toBe("categorical");
    const plain = await scan([file], { columns: ["last_seen"] });
    expect(col(plain, "last_seen").role).toBe("categorical");
  }, 120_000);

  it("shows the range in the table", () => {
    const line = renderTable(profile).split("\n").find((l) => l.includes("visit_date")) ?? "";
    expect(line).toContain("time");
    expect(line).toContain(`${range(1, (v) => v !== "").min} – ${range(1, (v) => v !== "").max}, day`);
  });

  it("is passed through unchanged by encode", async () => {
    const plan = path.join(dir, "plan");
    await ok(["scan", file, "--target", "no_show", "--out", plan, "--quiet"]);
    const out = path.join(dir, "encoded.csv");
    await ok(["encode", file, "--plan", plan, "--for", "scoring", "--out", out, "--quiet"]);
    const encoded = parseCsv(fs.readFileSync(out, "utf8"));
    const input = parseCsv(fs.readFileSync(file, "utf8"));
    expect(csvColumn(encoded, "visit_date")).toEqual(csvColumn(input, "visit_date"));
    expect(csvColumn(encoded, "check_in")).toEqual(csvColumn(input, "check_in"));
  }, 180_000);
});
