/**
 * Invented vet-clinic extracts for the scoring-SQL tests, and a plan that uses every encoding
 * kind (a user editing scan's plan): indicator, one-hot, pooled one-hot, frequency, codes,
 * salted hashing, flat target encoding, backoff target encoding (postcode prefixes), a
 * hierarchical prior (ward codes split on '-'), hashing of backoff groups (patient tags), and
 * codes over backoff groups (microchip batches: the tag text again, so no extra random draw;
 * tableSize below the group count so some groups take code 0).
 * `later` draws the same world plus unseen levels in every column; both have missing values.
 * Two numeric columns pass through typed (encode/passThrough): `lead_days`, integers (some
 * negative: booked after the visit), and `fee`, amounts with cents; both taken from the row
 * number, not from the random stream, so the other columns are drawn as before.
 */
import fs from "node:fs";
import path from "node:path";
import type { Profile } from "../../src/profile/types.js";
import { mulberry32 } from "../helpers/tmp.js";

const CLINICS = ["Yarrowby Vets 24", "Foxlease Vets 31", "Vetchley Vets 22", "Hollin Pet Care", "Marsh \"Lane\" Vets", "Brackwater, Vets"];
const SPECIES = ["cat", "dog"];
const CHANNELS = ["web", "phone", "walk-in"];
const REASONS = ["vaccination", "dental cleaning", "skin irritation", "hairball", "annual wellness exam", "limping", "it's an emergency"];
const BREEDS = ["Maine Coon", "Golden Retriever", "French Bulldog", "Meadow Longhair", "Canyon Shorthair", "Beagle", "Siamese"];
const PLANS = ["basic", "standard", "premium", "breeder"];
const DISTRICTS = ["120", "135", "217", "301", "356", "512", "603", "725", "802", "917"];
/** Rare districts: each too small for a group, together a group under their first digit "8". */
const RARE_DISTRICTS = ["861", "862", "863", "864"];

export const SCORING_COLUMNS = ["id", "lead_days", "fee", "clinic", "species", "channel", "reason", "breed", "vet", "insurance", "postcode", "ward", "tag", "chip", "no_show"];

export function scoringExtract(rows: number, seed: number, later: boolean): string {
  const r = mulberry32(seed);
  const pick = <T>(xs: readonly T[], skew = 1) => xs[Math.min(xs.length - 1, Math.floor(r() ** skew * xs.length))]!;
  const maybe = (v: string, p = 0.04) => (r() < p ? "" : v);
  const csvText = (v: string) => (/[",]/.test(v) ? `"${v.replaceAll('"', '""')}"` : v);
  const out = [SCORING_COLUMNS.join(",")];
  for (let i = 0; i < rows; i++) {
    const unseen = later && r() < 0.15;
    const u = r();
    const district = unseen && u < 0.33 ? "444" : unseen && u < 0.66 ? "865" : !later && u < 0.012 ? pick(RARE_DISTRICTS) : pick(DISTRICTS, 1.6);
    const postcode = `${district}${String(Math.floor(r() * (later ? 100 : 30))).padStart(2, "0")}`;
    const ward = `${pick(["N", "S", "E", "W"])}${unseen && r() < 0.5 ? "Q" : ""}-${Math.floor(r() * 6)}-${Math.floor(r() * 20)}`;
    const tag = `${pick(["AB", "AC", "BD", "ZX"], 1.5)}${String(Math.floor(r() * (later ? 400 : 120))).padStart(3, "0")}`;
    const y = r() < 0.2 + (district < "300" ? 0.15 : 0) + (ward.startsWith("N") ? 0.1 : 0) ? "1" : "0";
    const leadDays = i % 29 === 3 ? "" : String(((i * 37) % 61) - 5);
    const cents = ((i * 7919) % 40000) + 1250;
    const fee = i % 31 === 7 ? "" : `${Math.floor(cents / 100)}.${String(cents % 100).padStart(2, "0")}`;
    const row = [
      `a${i}`, leadDays, fee,
      maybe(unseen && r() < 0.3 ? "Newfield Vets 7" : pick(CLINICS, 1.4)),
      maybe(unseen && r() < 0.3 ? "rabbit" : pick(SPECIES)),
      maybe(unseen && r() < 0.3 ? "app" : pick(CHANNELS)),
      maybe(unseen && r() < 0.3 ? "eye check" : pick(REASONS, 1.8)),
      maybe(unseen && r() < 0.3 ? "Sphynx" : pick(BREEDS, 1.5)),
      maybe(`V${Math.floor(r() ** 1.7 * (later ? 30 : 20))}`),
      maybe(unseen && r() < 0.3 ? "corporate" : pick(PLANS)),
      maybe(postcode), maybe(ward), maybe(tag), y,
    ];
    row.splice(row.length - 1, 0, row[row.length - 2]!); // chip: the tag cell again
    out.push(row.map(csvText).join(","));
  }
  return `${out.join("\n")}\n`;
}

/** Every encoding kind, by column (params as scan's plan writes them; parents deepest first). */
export const SCORING_ENCODINGS: Record<string, { encoding: string; params: Record<string, unknown> }> = {
  id: { encoding: "keep", params: {} },
  species: { encoding: "indicator", params: { one: "cat", zero: "dog" } },
  channel: { encoding: "one-hot", params: { levels: ["web", "phone"] } },
  reason: { encoding: "pooled-one-hot", params: { keep: ["vaccination", "dental cleaning", "it's an emergency"], other: "other" } },
  breed: { encoding: "frequency", params: {} },
  vet: { encoding: "codes", params: { tableSize: 6 } },
  clinic: { encoding: "hashing", params: { width: 8, hash: "md5-first8-le", salt: "clinic-" } },
  insurance: { encoding: "target-kfold", params: { weight: 3.5, folds: 5, seed: 42 } },
  postcode: { encoding: "target-kfold", params: { grouping: "backoff", parents: [{ kind: "prefix", length: 3 }, { kind: "prefix", length: 1 }], minRows: 12, weight: 2.5 } },
  ward: { encoding: "target-kfold", params: { prior: "hierarchical", parent: { kind: "tokens", count: 2, delimiters: "-" }, weight: 4, parentWeight: 9 } },
  tag: { encoding: "hashing", params: { width: 16, hash: "md5-first8-le", salt: "", grouping: "backoff", parents: [{ kind: "prefix", length: 3 }, { kind: "prefix", length: 2 }], minRows: 6 } },
  chip: { encoding: "codes", params: { tableSize: 9, order: "descending training frequency", unseen: 0, grouping: "backoff", parents: [{ kind: "prefix", length: 3 }, { kind: "prefix", length: 2 }], minRows: 6 } },
};

/** Rewrites the plan folder's profile.json with SCORING_ENCODINGS. */
export function useEveryEncoding(planDir: string): Profile {
  const file = path.join(planDir, "profile.json");
  const profile = JSON.parse(fs.readFileSync(file, "utf8")) as Profile;
  for (const c of profile.columns) {
    const e = SCORING_ENCODINGS[c.name];
    if (e) c.recommendation = { ...c.recommendation, encoding: e.encoding as never, params: e.params };
  }
  fs.writeFileSync(file, JSON.stringify(profile));
  return profile;
}
