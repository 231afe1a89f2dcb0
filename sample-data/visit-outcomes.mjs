#!/usr/bin/env node
/**
 * A generated veterinary-clinic visit log with a three-class outcome (invented data, seeded; the
 * scenario of `--target-kind multiclass`, README "Multi-class targets"):
 *  - `visit_outcome`: attended / no_show / cancelled_late;
 *  - `booking_channel`: phone / web / app / walk-in — web and app bookings cancel late more,
 *    walk-ins almost always attend;
 *  - `clinic`: 40 clinics, each with its own no-show and late-cancel tilt (a column whose levels
 *    move the classes differently);
 *  - `referral`: 300 partner codes with a long tail of rare codes and NO effect on the outcome
 *    (a column that should not be target-encoded);
 *  - `species`: four values, no effect.
 *
 *   node sample-data/visit-outcomes.mjs --rows N --seed S --out FILE.csv
 *
 * Also imported by the tests (test/fixtures/visitOutcomes.ts). Plain Node ESM, no dependencies.
 * Randomness: mulberry32 (sample-data/random.mjs).
 */
import { runGenerator } from "./generatorCli.mjs";
import { mulberry32 } from "./random.mjs";


const SPECIES = ["dog", "cat", "rabbit", "bird"];
/** Channel: [weight, no-show log-odds, late-cancel log-odds] against attending. */
const CHANNELS = [["phone", 0.4, 0, 0], ["web", 0.3, 0.3, 0.9], ["app", 0.2, 0.2, 0.7], ["walk-in", 0.1, -4, -4]];

/** @returns {{ header: string[], rows: string[][], csv: string }} */
export function visitOutcomes(rowCount = 6000, seed = 15) {
  const random = mulberry32(seed);
  const normal = () => Math.sqrt(-2 * Math.log(1 - random())) * Math.cos(2 * Math.PI * random());
  const clinics = Array.from({ length: 40 }, (_, i) => ({ name: `Clinic ${String(i + 1).padStart(2, "0")}`, weight: 1 / (i + 1) ** 0.7, noShow: 0.6 * normal(), late: 0.6 * normal() }));
  const clinicTotal = clinics.reduce((s, c) => s + c.weight, 0);
  const referrals = Array.from({ length: 300 }, (_, i) => ({ code: `R${String(i + 1).padStart(3, "0")}`, weight: 1 / (i + 1) }));
  const referralTotal = referrals.reduce((s, r) => s + r.weight, 0);
  const pick = (list, total) => { let u = random() * total; return list.find((x) => (u -= x.weight) <= 0) ?? list[list.length - 1]; };
  const header = ["visit_id", "clinic", "booking_channel", "referral", "species", "visit_outcome"];
  const rows = [];
  for (let i = 0; i < rowCount; i++) {
    const clinic = pick(clinics, clinicTotal);
    let c = random();
    const channel = CHANNELS.find((x) => (c -= x[1]) <= 0) ?? CHANNELS[0];
    const referral = pick(referrals, referralTotal);
    // multinomial logit against "attended": exp(0) : exp(−2 + effects) : exp(−2.3 + effects)
    const a = 1, n = Math.exp(-2 + channel[2] + clinic.noShow), l = Math.exp(-2.3 + channel[3] + clinic.late);
    const u = random() * (a + n + l);
    const outcome = u < a ? "attended" : u < a + n ? "no_show" : "cancelled_late";
    rows.push([`V${i + 1}`, clinic.name, channel[0], referral.code, SPECIES[Math.floor(random() * 4)], outcome]);
  }
  return { header, rows, csv: [header.join(","), ...rows.map((r) => r.join(","))].join("\n") + "\n" };
}

runGenerator(import.meta.url, "visit-outcomes.mjs", visitOutcomes);
