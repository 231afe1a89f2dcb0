#!/usr/bin/env node
/**
 * tailsift sample-data generator: an invented appointment log of a regional network of veterinary
 * clinics. Every name, code and effect below is made up; no real clinic, person or brand.
 *
 *   node sample-data/generate.mjs --rows N --seed S --out FILE [--format csv|csv.gz|tsv] [--shift]
 *
 * Deterministic: the same arguments give the same bytes. The "world" (clinics, vets, postcodes,
 * breeds, visit reasons and their effects) is built from a fixed constant, WORLD_SEED, so every
 * seed samples the SAME population; --seed only drives the row draws. --shift draws a later
 * extract from the same world with three planned changes (see "Drift" below).
 * Rows are streamed in chunks of CHUNK_ROWS (constant memory); .csv.gz goes through node:zlib.
 * No field ever needs CSV quoting: no value contains a comma, tab, quote or line break.
 *
 * Randomness: sfc32 ("small fast counter", Chris Doty-Humphrey's PractRand suite), seeded through
 * the MurmurHash3 fmix32 finaliser and warmed up by 12 draws: common practice for seeded JS PRNGs.
 * Categorical draws use Vose's alias method (M. D. Vose, "A linear algorithm for generating random
 * numbers with a given distribution", IEEE Trans. Software Eng. 17(9), 1991): one uniform per draw.
 *
 * ---- The model: which columns carry signal ---------------------------------------------------
 * Draw order per row: clinic → vet (within clinic) → owner region (75 % the clinic's home region,
 * else network-wide) → district → postcode → species → breed (within species) → booking channel →
 * visit reason (within species) → lead time → date → no_show → invoice → referral → insurance.
 *
 * no_show ~ Bernoulli(p), logit(p) = B0
 *     + CHANNEL_LOGIT[channel]            phone 0, web +0.30, app +0.15, walk-in −6 (≈ never)
 *     + 0.45 · ln(1 + lead_time_days)     longer lead → more no-shows
 *     + region effect                     REGIONS table below: 04 +0.8, 27 +0.7, 56 +0.6, 84 +0.9,
 *                                         11 −0.4, 38 −0.3, others 0
 *     + district effect                   N(0, 0.25²) per district (3-digit prefix), fixed
 *     + clinic effect                     N(0, 0.15²) per clinic, fixed ("a little")
 *     + reason effect                     by category (REASON_CATEGORIES.noShow) + 0.30 for follow-ups
 *     + (--shift only) +1.2 for SHIFT_CLINIC
 *   B0 = −3.27 was calibrated by simulation so the base no-show rate is ≈ 12 % (measured on
 *   10M rows: see README). No effect of vet (beyond its clinic), species, breed, referral_code,
 *   insurance_plan, appointment_date or the postcode digits beyond the district.
 *
 * invoice_amount: no-show → 0.00 (75 %) or a 25.00 missed-appointment fee (25 %). Otherwise
 *   ln(amount) = ln(reason price) + ln(SPECIES_PRICE[species]) + clinic price effect N(0, 0.15²)
 *              + breed price effect N(0, 0.05²) + noise N(0, 0.30²), rounded to cents.
 *   Reason price = category base × exp(N(0, 0.25²)) per reason, halved for follow-ups:
 *   visit_reason strong, species and clinic moderate, breed weak; nothing else.
 *
 * lead_time_days: 0 for walk-ins; else floor(Exponential(mean = reason-category lead mean ×
 *   CHANNEL_LEAD[channel])), capped at 120.
 *
 * Drift (--shift): (a) 10 % of rows get postcodes from each district's reserve suffixes, which
 *   the base never produces; (b) channel mix phone .38→.26, web .30→.42; (c) +1.2 no-show logit
 *   at SHIFT_CLINIC. Everything else is drawn as in the base.
 */
import { createWriteStream, renameSync, rmSync, statSync } from "node:fs";
import { dirname, resolve } from "node:path";
import { Readable } from "node:stream";
import { pipeline } from "node:stream/promises";
import { parseArgs } from "node:util";
import { createGzip } from "node:zlib";

// ---- randomness ------------------------------------------------------------------------------

/** MurmurHash3 fmix32 finaliser: a 32-bit avalanche mix. */
function fmix32(x) {
  x = Math.imul(x ^ (x >>> 16), 0x85ebca6b);
  x = Math.imul(x ^ (x >>> 13), 0xc2b2ae35);
  return (x ^ (x >>> 16)) >>> 0;
}

/** sfc32 seeded from a safe integer and a stream number; returns uniforms in [0, 1). */
function makeRng(seed, stream) {
  const lo = seed >>> 0;
  const hi = Math.floor(seed / 4294967296) >>> 0;
  let a = fmix32(lo ^ 0x9e3779b9);
  let b = fmix32(hi ^ 0x85ebca6b ^ a);
  let c = fmix32(stream ^ 0xc2b2ae35 ^ b);
  let d = fmix32(a ^ b ^ c ^ 0x27d4eb2f);
  const next = () => {
    const t = (((a + b) | 0) + d) | 0;
    d = (d + 1) | 0;
    a = b ^ (b >>> 9);
    b = (c + (c << 3)) | 0;
    c = (c << 21) | (c >>> 11);
    c = (c + t) | 0;
    return (t >>> 0) / 4294967296;
  };
  for (let i = 0; i < 12; i++) next();
  return next;
}

/** Standard normal by Box–Muller (one of the pair is used). */
function gauss(rng) {
  const u = 1 - rng();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rng());
}

/** Vose's alias table for the given non-negative weights. */
function aliasTable(weights) {
  const n = weights.length;
  let sum = 0;
  for (const w of weights) sum += w;
  const prob = new Float64Array(n).fill(1);
  const alias = new Int32Array(n);
  const scaled = weights.map((w) => (w * n) / sum);
  const small = [];
  const large = [];
  scaled.forEach((s, i) => (s < 1 ? small : large).push(i));
  while (small.length > 0 && large.length > 0) {
    const s = small.pop();
    const l = large.pop();
    prob[s] = scaled[s];
    alias[s] = l;
    scaled[l] = scaled[l] + scaled[s] - 1;
    (scaled[l] < 1 ? small : large).push(l);
  }
  return { n, prob, alias };
}

/** One draw from an alias table with one uniform. */
function pick(table, u) {
  const x = u * table.n;
  const i = x | 0;
  return x - i < table.prob[i] ? i : table.alias[i];
}

/** Fisher–Yates shuffle in place. */
function shuffle(items, rng) {
  for (let i = items.length - 1; i > 0; i--) {
    const j = Math.floor(rng() * (i + 1));
    [items[i], items[j]] = [items[j], items[i]];
  }
  return items;
}

const zipf = (n, s) => Array.from({ length: n }, (_, r) => 1 / Math.pow(r + 1, s));

// ---- the invented world ----------------------------------------------------------------------

const WORLD_SEED = 20250101;
const B0 = -3.27;
const SHIFT_CLINIC = 12; // index into CLINIC_PLACES: "Marshcombe Vets 13"
const SHIFT_CLINIC_LOGIT = 1.2;
const NEW_POSTCODE_SHARE = 0.1;
const HOME_REGION_SHARE = 0.75;

/** 25 owner regions: 2-digit postcode prefix, relative size, no-show logit effect. */
const REGIONS = [
  ["00", 3, 0], ["01", 5, 0], ["03", 2, 0], ["04", 6, 0.8], ["06", 3, 0], ["08", 4, 0],
  ["11", 9, -0.4], ["14", 4, 0], ["17", 3, 0], ["20", 12, 0], ["23", 5, 0], ["27", 7, 0.7],
  ["30", 4, 0], ["34", 2, 0], ["38", 8, -0.3], ["42", 3, 0], ["47", 5, 0], ["51", 2, 0],
  ["56", 6, 0.6], ["60", 10, 0], ["65", 3, 0], ["71", 4, 0], ["77", 2, 0], ["84", 5, 0.9],
  ["92", 3, 0],
];

const CLINIC_PLACES = [
  "Alderbank", "Brackenford", "Cobblewick", "Dunmere Quay", "Elmhollow", "Fernhythe", "Gorsefield",
  "Hazelmoor", "Ironleigh", "Juniper Vale", "Kestrelton", "Larchmere", "Marshcombe", "Nettlebury",
  "Oxlip Green", "Pebblestow", "Quillhaven", "Rushbrook End", "Sloeford", "Thistlecote",
  "Umberwick", "Vetchley", "Willowmarsh", "Yarrowby", "Zephyr Point", "Ashcombe Ridge",
  "Birchwater", "Cloverdene", "Driftmoor", "Emberly Cross", "Foxlease", "Greywater Bay",
  "Heathercombe", "Inglenook Rise", "Kingfisher Reach", "Lantern Hill", "Millstream",
  "Northwold Gate", "Orchard Hythe", "Saltmarsh Lane",
];
const TOTAL_VETS = 400;

const SPECIES = ["dog", "cat", "rabbit", "bird", "reptile", "ferret"];
const SPECIES_WEIGHT = [0.52, 0.33, 0.06, 0.04, 0.03, 0.02];
const SPECIES_PRICE = [1.0, 0.92, 0.78, 0.7, 1.15, 0.85];

const ADJ = [
  "Highland", "Coastal", "Marsh", "Alpine", "Northern", "Valley", "Moorland", "Forest", "Island",
  "Prairie", "Harbour", "Ridge", "Lowland", "Meadow", "Canyon", "Fjord", "Steppe", "Delta", "Heath",
  "Glen", "Tundra", "Riverside", "Cliff",
];
/** Per species: common generic names (most common first), invented "adjective type" tail, count. */
const BREEDS = [
  [["Mixed Breed", "Labrador Retriever", "French Bulldog", "German Shepherd", "Golden Retriever",
    "Cocker Spaniel", "Border Collie", "Dachshund", "Beagle", "Jack Russell Terrier",
    "Staffordshire Bull Terrier", "Poodle", "Shih Tzu", "Boxer", "Yorkshire Terrier", "Chihuahua",
    "Pug", "Siberian Husky", "Rottweiler", "Border Terrier", "Springer Spaniel",
    "Miniature Schnauzer", "Whippet", "Greyhound", "Bichon Frise", "Pomeranian",
    "Shetland Sheepdog", "Dalmatian", "Great Dane", "Bernese Mountain Dog"],
   ["Terrier", "Spaniel", "Hound", "Retriever", "Sheepdog", "Pointer", "Setter", "Mastiff",
    "Collie", "Spitz"], 260],
  [["Domestic Shorthair", "Domestic Longhair", "Domestic Medium Hair", "Siamese", "Maine Coon",
    "British Shorthair", "Ragdoll", "Persian", "Bengal", "Sphynx", "Burmese", "Abyssinian",
    "Russian Blue", "Norwegian Forest Cat", "Scottish Fold"],
   ["Shorthair", "Longhair", "Rex", "Curl", "Bobtail", "Tabby", "Mau"], 120],
  [["Mixed Rabbit", "Netherland Dwarf", "Holland Lop", "Mini Rex", "Lionhead", "Flemish Giant",
    "Dutch", "English Lop"], ["Lop", "Dwarf", "Rex", "Satin", "Angora", "Giant", "Harlequin"], 60],
  [["Budgerigar", "Cockatiel", "African Grey", "Lovebird", "Canary", "Zebra Finch", "Conure",
    "Cockatoo", "Amazon Parrot", "Macaw", "Chicken", "Duck"],
   ["Parakeet", "Finch", "Conure", "Lory", "Dove", "Parrotlet", "Lorikeet", "Canary"], 80],
  [["Bearded Dragon", "Leopard Gecko", "Corn Snake", "Ball Python", "Crested Gecko",
    "Red-eared Slider", "Tortoise", "Blue-tongued Skink", "Chameleon", "Iguana"],
   ["Gecko", "Skink", "Python", "Kingsnake", "Tortoise", "Monitor", "Anole", "Boa"], 60],
  [["Sable", "Albino", "Cinnamon", "Champagne", "Black Sable", "Silver", "Panda", "Blaze",
    "Dark-eyed White", "Chocolate", "Black", "Silver Mitt", "Sable Point", "Roan", "Mitt",
    "Badger", "Blaze Mitt", "Champagne Point", "Chocolate Mitt", "Cinnamon Point"], [], 20],
];
/** Breeds that also appear as spelling variants, and the variant rates. */
const VARIANT_BREEDS = ["Labrador Retriever", "Mixed Breed", "German Shepherd", "Golden Retriever",
  "Domestic Shorthair", "Domestic Longhair"];
const VARIANT_RATE = 0.025; // lower-case 48 %, double space 24 %, leading space 16 %, trailing 12 %

/** Visit-reason categories: price base, mean lead days, no-show logit effect. */
const REASON_CATEGORIES = {
  preventive: { price: 70, lead: 21, noShow: 0.2 },
  dental: { price: 340, lead: 18, noShow: 0 },
  surgical: { price: 620, lead: 25, noShow: -0.35 },
  diagnostic: { price: 210, lead: 7, noShow: 0 },
  emergency: { price: 520, lead: 0.4, noShow: -0.9 },
  medical: { price: 120, lead: 3, noShow: 0 },
  chronic: { price: 150, lead: 14, noShow: 0.1 },
  behaviour: { price: 110, lead: 20, noShow: 0.25 },
};
const FOLLOW_UP = { price: 0.5, lead: 12, noShow: 0.3, weight: 0.3 };
/** 75 reasons, most common first: [label, category, species restriction or ""]. */
const REASONS = [
  ["vaccination", "preventive"], ["annual wellness exam", "preventive"], ["skin irritation", "medical"],
  ["ear infection", "medical"], ["vomiting", "medical"], ["dental cleaning", "dental"],
  ["limping", "medical"], ["diarrhoea", "medical"], ["flea and tick treatment", "preventive"],
  ["neuter", "surgical"], ["spay", "surgical"], ["nail trim", "preventive"], ["itching", "medical"],
  ["eye discharge", "medical"], ["lump check", "medical"], ["deworming", "preventive"],
  ["blood panel", "diagnostic"], ["not eating", "medical"], ["coughing", "medical"],
  ["weight check", "preventive"], ["microchipping", "preventive"], ["senior wellness exam", "preventive"],
  ["arthritis management", "chronic"], ["x-ray", "diagnostic"], ["urinary tract infection", "medical"],
  ["hairball", "medical", "cat"], ["tooth extraction", "dental"], ["lethargy", "medical"],
  ["sneezing", "medical"], ["anal gland expression", "medical", "dog"], ["hot spot", "medical", "dog"],
  ["kidney disease monitoring", "chronic"], ["weight loss", "medical"], ["hair loss", "medical"],
  ["allergy management", "chronic"], ["wound repair", "surgical"], ["lump removal", "surgical"],
  ["ultrasound", "diagnostic"], ["urinalysis", "diagnostic"], ["diabetes management", "chronic"],
  ["thyroid check", "chronic", "cat"], ["bad breath", "dental"], ["excessive thirst", "medical"],
  ["constipation", "medical"], ["beak and nail trim", "preventive", "bird"],
  ["incisor overgrowth", "dental", "rabbit"], ["GI stasis", "emergency", "rabbit"],
  ["shedding problem", "medical", "reptile"], ["travel health certificate", "preventive"],
  ["heart murmur check", "chronic"], ["behaviour consultation", "behaviour"],
  ["anxiety consultation", "behaviour"], ["allergy testing", "diagnostic"], ["biopsy", "diagnostic"],
  ["abscess drainage", "surgical"], ["broken tooth", "dental"], ["gum disease", "dental"],
  ["dental x-ray", "dental"], ["poisoning", "emergency"], ["breathing difficulty", "emergency"],
  ["seizure", "emergency"], ["bleeding", "emergency"], ["road traffic injury", "emergency"],
  ["heatstroke", "emergency"], ["bloat", "emergency", "dog"], ["urinary blockage", "emergency", "cat"],
  ["egg binding", "emergency", "bird"], ["feather plucking", "medical", "bird"],
  ["adrenal disease", "chronic", "ferret"], ["insulinoma check", "chronic", "ferret"],
  ["snuffles", "medical", "rabbit"], ["shell damage", "emergency", "reptile"],
  ["metabolic bone disease", "chronic", "reptile"], ["mites", "medical"],
  ["foreign body removal", "surgical"],
];

const CHANNELS = ["phone", "web", "walk-in", "app"];
const CHANNEL_WEIGHT = [0.38, 0.3, 0.12, 0.2];
const CHANNEL_WEIGHT_SHIFT = [0.26, 0.42, 0.1, 0.22];
const CHANNEL_LOGIT = [0, 0.3, -6, 0.15];
const CHANNEL_LEAD = [1, 1.25, 0, 0.85];
const LEAD_LOGIT = 0.45;

const INSURANCE = ["", "basic", "standard", "extended", "premium", "accident-only"];
const INSURANCE_WEIGHT = [0.4, 0.18, 0.17, 0.12, 0.07, 0.06];
const REFERRAL_MISSING = 0.3;
const REFERRAL_REUSE = 0.03;
const MISSED_FEE_SHARE = 0.25;
const INVOICE_NOISE_SD = 0.3;

const FIRST_DAY = Date.UTC(2025, 0, 1);
const LAST_DAY = Date.UTC(2026, 5, 30);
const ID_MODULUS = 100_000_000; // 8-digit ids; rows are capped at this
const ID_MULTIPLIER = 61_803_399; // coprime with 10^8, so i ↦ (a·i + b) mod 10^8 is a bijection

/** Builds the fixed population every extract samples from. */
function buildWorld() {
  const rng = makeRng(WORLD_SEED, 0);
  const regionPick = aliasTable(REGIONS.map((r) => r[1]));

  // Districts (3rd digit) and postcodes: per district a base suffix set and a disjoint reserve.
  const regionDistricts = [];
  const districtEffect = [];
  const districtCodes = [];
  const districtNewCodes = [];
  for (const [prefix] of REGIONS) {
    const digits = shuffle([0, 1, 2, 3, 4, 5, 6, 7, 8, 9], rng).slice(0, 5 + Math.floor(rng() * 6));
    const ids = [];
    for (const digit of digits) {
      const suffixes = shuffle(Array.from({ length: 100 }, (_, i) => String(i).padStart(2, "0")), rng);
      const baseCount = 34 + Math.floor(rng() * 29);
      ids.push(districtEffect.length);
      districtEffect.push(0.25 * gauss(rng));
      districtCodes.push(suffixes.slice(0, baseCount).map((s) => `${prefix}${digit}${s}`));
      districtNewCodes.push(suffixes.slice(baseCount).map((s) => `${prefix}${digit}${s}`));
    }
    regionDistricts.push({ ids, pick: aliasTable(zipf(ids.length, 0.8)) });
  }
  const codePick = districtCodes.map((c) => aliasTable(zipf(c.length, 0.9)));
  const newCodePick = districtNewCodes.map((c) => aliasTable(zipf(c.length, 0.9)));

  // Clinics: skewed sizes, a home region each, small no-show and price effects, vets.
  const sizes = shuffle(zipf(CLINIC_PLACES.length, 0.8), rng);
  const clinicNames = CLINIC_PLACES.map((p, i) => `${p} Vets ${String(i + 1).padStart(2, "0")}`);
  const clinicRegion = CLINIC_PLACES.map(() => pick(regionPick, rng()));
  const clinicLogit = CLINIC_PLACES.map(() => 0.15 * gauss(rng));
  const clinicPrice = CLINIC_PLACES.map(() => Math.exp(0.15 * gauss(rng)));
  const sizeSum = sizes.reduce((s, w) => s + w, 0);
  const vetCounts = sizes.map((w) => Math.max(3, Math.floor((TOTAL_VETS * w) / sizeSum)));
  for (let k = 0; vetCounts.reduce((s, v) => s + v, 0) < TOTAL_VETS; k++) vetCounts[k % vetCounts.length]++;
  const vetCodes = shuffle(Array.from({ length: 9000 }, (_, i) => `V${1000 + i}`), rng);
  let nextVet = 0;
  const clinicVets = vetCounts.map((n) => vetCodes.slice(nextVet, (nextVet += n)));
  const vetPick = clinicVets.map((v) => aliasTable(v.map(() => 0.5 + rng())));

  // Breeds per species: named head + shuffled invented tail, Zipf weights, weak price effect.
  const breedPick = [];
  const breedNames = [];
  const breedPrice = [];
  const breedVariants = [];
  for (const [head, types, count] of BREEDS) {
    const tail = [];
    for (const type of types) for (const adj of ADJ) tail.push(`${adj} ${type}`);
    // Invented tail names are unique across species ("Highland Rex" is a cat or a rabbit, not both).
    const fresh = tail.filter((t) => !head.includes(t) && !breedNames.includes(t));
    const names = head.concat(shuffle(fresh, rng)).slice(0, count);
    const first = breedNames.length;
    for (const name of names) {
      breedNames.push(name);
      breedPrice.push(Math.exp(0.05 * gauss(rng)));
      breedVariants.push(VARIANT_BREEDS.includes(name) ? [name.toLowerCase(),
        name.replace(" ", "  "), ` ${name}`, `${name} `] : null);
    }
    breedPick.push({ first, table: aliasTable(zipf(names.length, 1.05)) });
  }

  // Visit reasons: each base reason plus a follow-up; per species alias over allowed reasons.
  const reasonNames = [];
  const reasonPrice = [];
  const reasonLead = [];
  const reasonLogit = [];
  const reasonWeight = [];
  const reasonSpecies = [];
  REASONS.forEach(([label, category, species = ""], rank) => {
    const cat = REASON_CATEGORIES[category];
    const price = cat.price * Math.exp(0.25 * gauss(rng));
    const weight = 1 / Math.pow(rank + 1, 0.9);
    reasonNames.push(label, `follow-up: ${label}`);
    reasonPrice.push(price, price * FOLLOW_UP.price);
    reasonLead.push(cat.lead, FOLLOW_UP.lead);
    reasonLogit.push(cat.noShow, cat.noShow + FOLLOW_UP.noShow);
    reasonWeight.push(weight, weight * FOLLOW_UP.weight);
    reasonSpecies.push(species, species);
  });
  const reasonPick = SPECIES.map((s) => {
    const ids = reasonNames.map((_, i) => i).filter((i) => reasonSpecies[i] === "" || reasonSpecies[i] === s);
    return { ids, table: aliasTable(ids.map((i) => reasonWeight[i])) };
  });

  const dates = [];
  for (let t = FIRST_DAY; t <= LAST_DAY; t += 86_400_000) dates.push(new Date(t).toISOString().slice(0, 10));

  return {
    regionPick, regionDistricts, districtEffect, districtCodes, districtNewCodes, codePick, newCodePick,
    clinicPick: aliasTable(sizes), clinicNames, clinicRegion, clinicLogit, clinicPrice, clinicVets, vetPick,
    speciesPick: aliasTable(SPECIES_WEIGHT), breedPick, breedNames, breedPrice, breedVariants,
    reasonNames, reasonPrice, reasonLead, reasonLogit, reasonPick, dates,
    regionLogit: REGIONS.map((r) => r[2]),
  };
}

// ---- rows ------------------------------------------------------------------------------------

const HEADER = ["appointment_id", "appointment_date", "clinic", "vet", "species", "breed",
  "owner_postcode", "booking_channel", "visit_reason", "referral_code", "insurance_plan",
  "lead_time_days", "no_show", "invoice_amount"];
const CHUNK_ROWS = 16_384;
const PAD2 = Array.from({ length: 100 }, (_, i) => String(i).padStart(2, "0"));
const PAD_ID = ["", "0", "00", "000", "0000", "00000", "000000", "0000000"];
const VARIANT_CUTS = [0.48, 0.72, 0.88, 1];

/** Yields the file as ASCII Buffers of CHUNK_ROWS rows each (the header first). */
function* generateChunks(rows, seed, shift, sep) {
  const w = buildWorld();
  const rng = makeRng(seed, shift ? 2 : 1);
  const channelPick = aliasTable(shift ? CHANNEL_WEIGHT_SHIFT : CHANNEL_WEIGHT);
  const insurancePick = aliasTable(INSURANCE_WEIGHT);
  const idOffset = Math.floor(rng() * ID_MODULUS);
  const ring = new Array(4096).fill("");
  let ringFill = 0;
  const nDates = w.dates.length;

  yield Buffer.from(HEADER.join(sep) + "\n", "latin1");
  const lines = [];
  for (let i = 0; i < rows; i++) {
    const clinic = pick(w.clinicPick, rng());
    const vet = w.clinicVets[clinic][pick(w.vetPick[clinic], rng())];
    const region = rng() < HOME_REGION_SHARE ? w.clinicRegion[clinic] : pick(w.regionPick, rng());
    const rd = w.regionDistricts[region];
    const district = rd.ids[pick(rd.pick, rng())];
    const postcode = shift && rng() < NEW_POSTCODE_SHARE
      ? w.districtNewCodes[district][pick(w.newCodePick[district], rng())]
      : w.districtCodes[district][pick(w.codePick[district], rng())];
    const species = pick(w.speciesPick, rng());
    const bp = w.breedPick[species];
    const breedId = bp.first + pick(bp.table, rng());
    let breed = w.breedNames[breedId];
    const variants = w.breedVariants[breedId];
    if (variants !== null && rng() < VARIANT_RATE) {
      const v = rng();
      breed = variants[v < VARIANT_CUTS[0] ? 0 : v < VARIANT_CUTS[1] ? 1 : v < VARIANT_CUTS[2] ? 2 : 3];
    }
    const channel = pick(channelPick, rng());
    const rp = w.reasonPick[species];
    const reason = rp.ids[pick(rp.table, rng())];
    const leadMean = w.reasonLead[reason] * CHANNEL_LEAD[channel];
    const lead = leadMean === 0 ? 0 : Math.min(120, Math.floor(-leadMean * Math.log(1 - rng())));
    const date = w.dates[Math.floor(rng() * nDates)];

    let logit = B0 + CHANNEL_LOGIT[channel] + LEAD_LOGIT * Math.log1p(lead) + w.regionLogit[region]
      + w.districtEffect[district] + w.clinicLogit[clinic] + w.reasonLogit[reason];
    if (shift && clinic === SHIFT_CLINIC) logit += SHIFT_CLINIC_LOGIT;
    const noShow = rng() < 1 / (1 + Math.exp(-logit));

    let invoice;
    if (noShow) {
      invoice = rng() < MISSED_FEE_SHARE ? "25.00" : "0.00";
    } else {
      const amount = w.reasonPrice[reason] * SPECIES_PRICE[species] * w.clinicPrice[clinic]
        * w.breedPrice[breedId] * Math.exp(INVOICE_NOISE_SD * gauss(rng));
      const cents = Math.round(amount * 100);
      invoice = `${Math.floor(cents / 100)}.${PAD2[cents % 100]}`;
    }

    let referral = "";
    if (rng() >= REFERRAL_MISSING) {
      if (ringFill > 0 && rng() < REFERRAL_REUSE) {
        referral = ring[Math.floor(rng() * Math.min(ringFill, ring.length))];
      } else {
        const x = Math.floor(rng() * 1679616).toString(36).padStart(4, "0");
        const y = Math.floor(rng() * 1679616).toString(36).padStart(4, "0");
        referral = `RF-${x}${y}`.toUpperCase();
        ring[ringFill++ % ring.length] = referral;
      }
    }
    const insurance = INSURANCE[pick(insurancePick, rng())];

    const idNum = String((ID_MULTIPLIER * i + idOffset) % ID_MODULUS);
    const id = `APT-${PAD_ID[8 - idNum.length]}${idNum}`;
    lines.push(`${id}${sep}${date}${sep}${w.clinicNames[clinic]}${sep}${vet}${sep}${SPECIES[species]}${sep}${breed}${sep}${postcode}${sep}${CHANNELS[channel]}${sep}${w.reasonNames[reason]}${sep}${referral}${sep}${insurance}${sep}${lead}${sep}${noShow ? "1" : "0"}${sep}${invoice}\n`);
    if (lines.length === CHUNK_ROWS) {
      yield Buffer.from(lines.join(""), "latin1");
      lines.length = 0;
    }
  }
  if (lines.length > 0) yield Buffer.from(lines.join(""), "latin1");
}

// ---- command line ----------------------------------------------------------------------------

const USAGE = "usage: node sample-data/generate.mjs --rows N --seed S --out FILE [--format csv|csv.gz|tsv] [--shift]";

/** Prints one line and exits 2. */
function fail(message) {
  process.stderr.write(`generate.mjs: ${message}\n`);
  process.exit(2);
}

function parseInteger(name, text, min, max) {
  if (text === undefined) fail(`--${name} is required; ${USAGE}`);
  if (!/^\d+$/.test(text)) fail(`--${name} must be a whole number, got '${text}'`);
  const n = Number(text);
  if (!Number.isSafeInteger(n) || n < min || n > max) fail(`--${name} must be between ${min} and ${max}, got '${text}'`);
  return n;
}

async function main() {
  let values;
  try {
    ({ values } = parseArgs({
      options: {
        rows: { type: "string" }, seed: { type: "string" }, out: { type: "string" },
        format: { type: "string" }, shift: { type: "boolean", default: false },
        help: { type: "boolean", short: "h", default: false },
      },
      strict: true, allowPositionals: false,
    }));
  } catch (error) {
    fail(`${String(error.message).split("\n")[0].replace(/\.$/, "")}; ${USAGE}`);
  }
  if (values.help) {
    process.stdout.write(`${USAGE}\n`);
    return;
  }
  const rows = parseInteger("rows", values.rows, 1, ID_MODULUS - 1);
  const seed = parseInteger("seed", values.seed, 0, Number.MAX_SAFE_INTEGER);
  if (values.out === undefined || values.out === "") fail(`--out is required; ${USAGE}`);
  const out = resolve(values.out);
  const lower = out.toLowerCase();
  const inferred = lower.endsWith(".csv.gz") ? "csv.gz" : lower.endsWith(".csv") ? "csv"
    : lower.endsWith(".tsv") ? "tsv" : undefined;
  const format = values.format ?? inferred;
  if (format === undefined) fail(`cannot infer the format of '${values.out}'; name it .csv, .csv.gz or .tsv, or pass --format`);
  if (!["csv", "csv.gz", "tsv"].includes(format)) fail(`--format must be csv, csv.gz or tsv, got '${format}'`);
  let dirOk = false;
  try {
    dirOk = statSync(dirname(out)).isDirectory();
  } catch {
    dirOk = false;
  }
  if (!dirOk) fail(`the folder of --out '${values.out}' does not exist; create it first`);

  // Write beside the destination, then rename: an interrupted run never leaves half a file.
  const temp = `${out}.${process.pid}.tmp`;
  const source = Readable.from(generateChunks(rows, seed, values.shift, format === "tsv" ? "\t" : ","), { objectMode: false });
  const sink = createWriteStream(temp, { highWaterMark: 1 << 20 });
  try {
    if (format === "csv.gz") await pipeline(source, createGzip({ level: 9, memLevel: 9 }), sink);
    else await pipeline(source, sink);
    renameSync(temp, out);
  } catch (error) {
    rmSync(temp, { force: true });
    process.stderr.write(`generate.mjs: writing '${values.out}' failed: ${error.message}\n`);
    process.exit(1);
  }
}

await main();
