import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { gunzipSync } from "node:zlib";

const ROOT = fileURLToPath(new URL("..", import.meta.url));
const GENERATOR = path.join(ROOT, "sample-data", "generate.mjs");
const COMMITTED = path.join(ROOT, "sample-data", "appointments.csv.gz");
const HEADER = ["appointment_id", "appointment_date", "clinic", "vet", "species", "breed",
  "owner_postcode", "booking_channel", "visit_reason", "referral_code", "insurance_plan",
  "lead_time_days", "no_show", "invoice_amount"];

let dir = "";

function generate(args: string[]): { status: number | null; stderr: string } {
  const run = spawnSync(process.execPath, [GENERATOR, ...args], { cwd: ROOT, encoding: "utf8" });
  return { status: run.status, stderr: run.stderr };
}

/** Runs the generator into the temp dir and returns the file's bytes. */
function make(name: string, args: string[]): Buffer {
  const out = path.join(dir, name);
  const run = generate([...args, "--out", out]);
  expect(run.stderr).toBe("");
  expect(run.status).toBe(0);
  return readFileSync(out);
}

/** Splits CSV text into rows of fields; valid because the generator never quotes (checked). */
function parse(text: string, sep = ","): { header: string[]; rows: string[][] } {
  const lines = text.split("\n");
  expect(lines.pop()).toBe(""); // the file ends with one newline
  const [head, ...body] = lines.map((line) => line.split(sep));
  return { header: head ?? [], rows: body };
}

function column(rows: string[][], name: string): string[] {
  const i = HEADER.indexOf(name);
  return rows.map((r) => r[i] ?? "");
}

const share = (values: string[], level: string): number =>
  values.filter((v) => v === level).length / values.length;

/**
 * Two-sided 99.9 % band for a sample proportion around p0 by the normal approximation to the
 * binomial (de Moivre–Laplace): p0 ± z·√(p0(1−p0)/n), z = 3.290527 (standard normal 0.9995
 * quantile, from memory).
 */
function band(p0: number, n: number): [number, number] {
  const half = 3.290527 * Math.sqrt((p0 * (1 - p0)) / n);
  return [p0 - half, p0 + half];
}

beforeAll(() => {
  dir = mkdtempSync(path.join(os.tmpdir(), "tailsift-sample-"));
});
afterAll(() => {
  rmSync(dir, { recursive: true, force: true });
});

describe("sample-data/generate.mjs", () => {
  it("gives identical bytes for the same seed and different bytes for another seed", () => {
    const a = make("a.csv", ["--rows", "5000", "--seed", "7"]);
    const b = make("b.csv", ["--rows", "5000", "--seed", "7"]);
    const c = make("c.csv", ["--rows", "5000", "--seed", "8"]);
    expect(a.equals(b)).toBe(true);
    expect(a.equals(c)).toBe(false);
  });

  it("writes the documented columns with the designed shapes", () => {
    const { header, rows } = parse(make("shape.csv", ["--rows", "5000", "--seed", "11"]).toString("latin1"));
    expect(header).toEqual(HEADER);
    expect(rows).toHaveLength(5000);
    // Fields are never quoted: every row splits into exactly 14 fields and no field has a quote.
    expect(rows.every((r) => r.length === HEADER.length && r.every((f) => !f.includes('"')))).toBe(true);

    const ids = column(rows, "appointment_id");
    expect(new Set(ids).size).toBe(5000);
    expect(ids.every((id) => /^APT-\d{8}$/.test(id))).toBe(true);
    // Not sorted (the ids are an affine permutation of the row counter).
    expect(ids.slice(1).some((id, i) => id < (ids[i] ?? ""))).toBe(true);

    const postcodes = column(rows, "owner_postcode");
    expect(postcodes.every((p) => /^\d{5}$/.test(p))).toBe(true);
    expect(postcodes.some((p) => p.startsWith("0"))).toBe(true);

    expect([...new Set(column(rows, "species"))].sort()).toEqual(
      ["bird", "cat", "dog", "ferret", "rabbit", "reptile"]);
    expect([...new Set(column(rows, "booking_channel"))].sort()).toEqual(["app", "phone", "walk-in", "web"]);

    const dates = column(rows, "appointment_date");
    expect(dates.every((d) => /^\d{4}-\d{2}-\d{2}$/.test(d) && d >= "2025-01-01" && d <= "2026-06-30")).toBe(true);
    const leads = column(rows, "lead_time_days").map(Number);
    expect(leads.every((d) => Number.isInteger(d) && d >= 0 && d <= 120)).toBe(true);
    expect(column(rows, "invoice_amount").every((v) => /^\d+\.\d{2}$/.test(v))).toBe(true);

    // no_show: designed base rate 0.12 (B0 calibrated by simulation, see generate.mjs);
    // 99.9 % normal-approximation band for n = 5000 is 0.1049–0.1351.
    const noShow = column(rows, "no_show");
    expect(noShow.every((v) => v === "0" || v === "1")).toBe(true);
    const [low, high] = band(0.12, 5000);
    const rate = share(noShow, "1");
    expect(rate).toBeGreaterThan(low);
    expect(rate).toBeLessThan(high);

    // Walk-ins almost never miss (logit −6); no-shows are billed 0.00 or the 25.00 fee.
    const walkInMisses = rows.filter((r) => r[7] === "walk-in" && r[12] === "1").length;
    expect(walkInMisses).toBeLessThanOrEqual(2);
    expect(rows.filter((r) => r[12] === "1").every((r) => r[13] === "0.00" || r[13] === "25.00")).toBe(true);
  });

  it("writes the same rows as TSV and as .csv.gz", () => {
    const csv = make("f.csv", ["--rows", "300", "--seed", "3"]).toString("latin1");
    const tsv = make("f.tsv", ["--rows", "300", "--seed", "3"]).toString("latin1");
    const gz = gunzipSync(make("f.csv.gz", ["--rows", "300", "--seed", "3"])).toString("latin1");
    expect(tsv).toBe(csv.replaceAll(",", "\t"));
    expect(gz).toBe(csv);
  });

  it("reproduces the committed extract byte for byte from the command in sample-data/README.md", () => {
    const readme = readFileSync(path.join(ROOT, "sample-data", "README.md"), "utf8");
    const match = /node sample-data\/generate\.mjs --rows (\d+) --seed (\d+) --out sample-data\/appointments\.csv\.gz/.exec(readme);
    expect(match).not.toBeNull();
    const fresh = make("appointments.csv.gz", ["--rows", match?.[1] ?? "", "--seed", match?.[2] ?? ""]);
    const committed = readFileSync(COMMITTED);
    expect(gunzipSync(fresh).equals(gunzipSync(committed))).toBe(true);
    expect(fresh.equals(committed)).toBe(true);
  });

  it("--shift adds unseen postcodes, moves the channel mix and raises one clinic's no-shows", () => {
    const base = parse(make("base.csv", ["--rows", "20000", "--seed", "5"]).toString("latin1")).rows;
    const later = parse(make("later.csv", ["--rows", "20000", "--seed", "5", "--shift"]).toString("latin1")).rows;
    const committed = parse(gunzipSync(readFileSync(COMMITTED)).toString("latin1")).rows;
    const known = new Set(column(committed, "owner_postcode"));
    const unseen = (rows: string[][]): number => column(rows, "owner_postcode").filter((p) => !known.has(p)).length / rows.length;
    // 10 % of shifted rows carry reserve postcodes the base never draws: at least the lower
    // 99.9 % normal-approximation bound around 0.10 for n = 20000 (0.0930).
    expect(unseen(later)).toBeGreaterThan(band(0.1, 20000)[0]);
    // Base rows miss the committed extract's postcodes only through its rare codes.
    expect(unseen(base)).toBeLessThan(0.02);

    // Channel mix: web 0.30 → 0.42, phone 0.38 → 0.26 (designed); each shifted share lies
    // outside the base design's 99.9 % band and inside the shifted design's band.
    const web = share(column(later, "booking_channel"), "web");
    const phone = share(column(later, "booking_channel"), "phone");
    expect(web).toBeGreaterThan(band(0.3, 20000)[1]);
    expect(web).toBeGreaterThan(band(0.42, 20000)[0]);
    expect(phone).toBeLessThan(band(0.38, 20000)[0]);
    expect(phone).toBeLessThan(band(0.26, 20000)[1]);

    // Marshcombe Vets 13 gets +1.2 on the no-show logit: its shifted rate lies above the 99.9 %
    // band around its base-extract rate.
    const clinicRate = (rows: string[][]): [number, number] => {
      const mine = rows.filter((r) => r[2] === "Marshcombe Vets 13");
      return [share(column(mine, "no_show"), "1"), mine.length];
    };
    const [baseRate, baseRows] = clinicRate(base);
    const [laterRate] = clinicRate(later);
    expect(baseRows).toBeGreaterThan(200);
    expect(laterRate).toBeGreaterThan(band(baseRate, baseRows)[1]);
  });

  it("exits 2 with one line on bad arguments", () => {
    const cases = [
      ["--rows", "abc", "--seed", "1", "--out", path.join(dir, "x.csv")],
      ["--rows", "10", "--seed", "1"],
      ["--rows", "10", "--seed", "1", "--out", path.join(dir, "x.parquet")],
      ["--rows", "10", "--seed", "1", "--out", path.join(dir, "x.csv"), "--colour"],
      ["--rows", "10", "--seed", "-3", "--out", path.join(dir, "x.csv")],
      ["--rows", "10", "--seed", "1", "--out", path.join(dir, "no-such-folder", "x.csv")],
    ];
    for (const args of cases) {
      const run = generate(args);
      expect(run.status).toBe(2);
      expect(run.stderr.trimEnd().split("\n")).toHaveLength(1);
      expect(run.stderr).toMatch(/^generate\.mjs: /);
    }
  });
});
