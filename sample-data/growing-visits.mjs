#!/usr/bin/env node
/**
 * A generated veterinary-clinic visit log whose level set grows over time (invented data, seeded;
 * the scenario of `--time`, README "Time-ordered validation"): one year of visits in time order,
 * with
 *  - `clinic`: 30 clinics, the same all year (a stable level set);
 *  - `referral`: the referring partner's code: 60 % of visits come through 40 long-standing
 *    partners, the rest through short-lived campaign codes that keep appearing all year (each is
 *    born on a day of the year and its use fades over about a month), so later months meet many
 *    codes the earlier months never saw;
 *  - `species`: four values, stable;
 *  - `no_show`: 0/1, driven by the clinic and by the referral code (each code has its own rate).
 * Rows are written in time order; `visit_time` is `YYYY-MM-DD HH:MM`.
 *
 *   node sample-data/growing-visits.mjs --rows N --seed S --out FILE.csv
 *
 * Also imported by the tests (test/fixtures/growingVisits.ts). Plain Node ESM, no dependencies.
 * Randomness: mulberry32 (sample-data/random.mjs).
 */
import { runGenerator } from "./generatorCli.mjs";
import { mulberry32 } from "./random.mjs";


const SPECIES = ["dog", "cat", "rabbit", "bird"];
const DAY_MS = 86_400_000;

/** @returns {{ header: string[], rows: string[][], csv: string }} */
export function growingVisits(rowCount = 4000, seed = 12, codes = 700) {
  const random = mulberry32(seed);
  const clinics = Array.from({ length: 30 }, (_, i) => ({ name: `C${String(i + 1).padStart(2, "0")}`, weight: 1 / (i + 1), rate: 0.05 + 0.3 * random() }));
  const clinicTotal = clinics.reduce((s, c) => s + c.weight, 0);
  const referrals = Array.from({ length: codes }, (_, i) => ({ code: `R${String(i + 1).padStart(3, "0")}`, born: Math.floor(random() * 400) - 35, rate: random() < 0.5 ? 0.05 : 0.45 }));
  const partners = Array.from({ length: 40 }, (_, i) => ({ code: `P${String(i + 1).padStart(2, "0")}`, born: -1, rate: random() < 0.5 ? 0.1 : 0.35 }));
  const days = Array.from({ length: rowCount }, () => Math.floor(random() * 365)).sort((a, b) => a - b);
  const header = ["visit_id", "visit_time", "clinic", "referral", "species", "no_show"];
  const rows = [];
  for (const [i, day] of days.entries()) {
    let u = random() * clinicTotal;
    const clinic = clinics.find((c) => (u -= c.weight) <= 0) ?? clinics[clinics.length - 1];
    // the codes born by this day, each weighted by how recent it is (use fades over ~30 days)
    const live = referrals.filter((r) => r.born <= day).map((r) => ({ r, w: Math.exp(-(day - r.born) / 30) }));
    const total = live.reduce((s, x) => s + x.w, 0);
    let v = random() * total;
    const referral = random() < 0.6 ? partners[Math.floor(random() * partners.length)] : (live.find((x) => (v -= x.w) <= 0) ?? live[live.length - 1]).r;
    const minute = 8 * 60 + Math.floor(random() * 600);
    const stamp = new Date(Date.UTC(2025, 0, 1) + day * DAY_MS + minute * 60_000).toISOString().slice(0, 16).replace("T", " ");
    const p = 0.5 * clinic.rate + 0.5 * referral.rate;
    rows.push([`V${i + 1}`, stamp, clinic.name, referral.code, SPECIES[Math.floor(random() * 4)], random() < p ? "1" : "0"]);
  }
  return { header, rows, csv: [header.join(","), ...rows.map((r) => r.join(","))].join("\n") + "\n" };
}

runGenerator(import.meta.url, "growing-visits.mjs", growingVisits);
