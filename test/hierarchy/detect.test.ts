/**
 * Hierarchy detection on bounded samples of levels (pure): fixed-length codes with leading zeros,
 * mixed letter/digit codes, delimited composite keys — and no hierarchy for free text or random
 * identifiers. Expected parents are worked out by hand from the generated shapes.
 */
import { describe, expect, it } from "vitest";
import { detectHierarchy } from "../../src/hierarchy/detect.js";
import { detectDelimited, signatureOf, tokensOf } from "../../src/hierarchy/delimited.js";
import { detectFixedLength } from "../../src/hierarchy/fixedLength.js";
import { parentOf } from "../../src/hierarchy/parent.js";
import { mulberry32 } from "../helpers/tmp.js";

const rand = mulberry32(3);
const pick = (s: string) => s.charAt(Math.floor(rand() * s.length));
const DIGITS = "0123456789";
const LETTERS = "ABCDEFGHIJKLMNOPQRSTUVWXYZ";

/** n distinct values from a generator. */
function distinct(n: number, make: () => string): string[] {
  const out = new Set<string>();
  while (out.size < n) out.add(make());
  return [...out];
}

describe("fixed-length codes", () => {
  it("zero-padded 5-digit codes: shape DDDDD, prefixes 1–4 as parents", () => {
    // 30 three-digit districts below 100 (so the codes start with "00"/"0"), 20 leaves each
    const districts = distinct(30, () => `0${pick(DIGITS)}${pick(DIGITS)}`);
    const levels = districts.flatMap((d) => distinct(20, () => `${d}${pick(DIGITS)}${pick(DIGITS)}`));
    expect(levels.every((l) => l.length === 5 && l.startsWith("0"))).toBe(true);
    const h = detectHierarchy(levels);
    expect(h?.pattern).toBe("fixed-length");
    expect(h?.shape).toBe("DDDDD");
    // prefix 1 is always "0" (one group, not a parent); 2, 3, 4 group the 600 codes
    expect(h?.parents).toEqual([2, 3, 4].map((length) => ({ kind: "prefix", length })));
    expect(parentOf({ kind: "prefix", length: 3 }, "00501")).toBe("005"); // leading zeros kept
  });

  it("mixed letter/digit codes like AB12CD: shape LLDDLL", () => {
    const levels = distinct(800, () => `${pick("ABCD")}${pick(LETTERS)}${pick(DIGITS)}${pick(DIGITS)}${pick(LETTERS)}${pick(LETTERS)}`);
    expect(detectFixedLength(levels)?.shape).toBe("LLDDLL");
    const h = detectHierarchy(levels);
    expect(h?.pattern).toBe("fixed-length");
    expect(h?.parents.map((p) => (p.kind === "prefix" ? p.length : 0))).toEqual([1, 2, 3, 4, 5]);
  });

  it("tolerates a few malformed levels (up to 5 %)", () => {
    const levels = [...distinct(400, () => `1${pick(DIGITS)}${pick(DIGITS)}${pick(DIGITS)}`), "n/a", "unknown", "12", "9x9x"];
    expect(detectHierarchy(levels)?.shape).toBe("DDDD");
  });

  it("does not claim random hexadecimal identifiers (classes mix at every position)", () => {
    const levels = distinct(500, () => Array.from({ length: 8 }, () => pick("0123456789abcdef")).join(""));
    expect(detectFixedLength(levels)).toBeNull();
    expect(detectHierarchy(levels)).toBeNull();
  });

  it("does not claim lower-case words of one length (their first letters would group them)", () => {
    const words = ["mango", "melon", "maize", "mocha", "cress", "chard", "cocoa", "curry", "peach", "pecan", "plums", "prune"];
    expect(new Set(words.map((w) => w.charAt(0))).size).toBe(3); // would pass the sharing test
    expect(detectHierarchy(words)).toBeNull();
    expect(detectHierarchy(words.map((w) => w.toUpperCase()))?.shape).toBe("LLLLL"); // upper-case codes do count
  });
});

describe("delimited composite keys", () => {
  it("A-B@7: signature '-@', parents = first 1 and first 2 tokens", () => {
    const levels = distinct(600, () => `${pick("ABCDE")}-${pick(LETTERS)}${pick(LETTERS)}@${pick(DIGITS)}${pick(DIGITS)}`);
    expect(signatureOf("A-B@7")).toBe("-@");
    expect(tokensOf("A-B@7", "-@")).toEqual(["A", "B", "7"]);
    const h = detectHierarchy(levels);
    expect(h?.pattern).toBe("delimited");
    expect(h?.shape).toBe("-@");
    expect(h?.parents).toEqual([{ kind: "tokens", count: 1, delimiters: "-@" }, { kind: "tokens", count: 2, delimiters: "-@" }]);
    expect(parentOf({ kind: "tokens", count: 1, delimiters: "-@" }, "A-B@7")).toBe("A");
    expect(parentOf({ kind: "tokens", count: 2, delimiters: "-@" }, "A-B@7")).toBe("A-B");
    expect(parentOf({ kind: "tokens", count: 2, delimiters: "-@" }, "A-B")).toBe("A-B"); // too few tokens: its own parent
  });

  it("space-separated codes (not words) count: 'NW1 6XE'-like keys", () => {
    const levels = distinct(500, () => `${pick("NSEW")}${pick("NSEW")}${pick(DIGITS)} ${pick(DIGITS)}${pick(LETTERS)}${pick(LETTERS)}`);
    expect(detectHierarchy(levels)?.pattern).toBe("delimited");
  });
});

describe("no hierarchy for free text", () => {
  it("breed names with varying word counts", () => {
    const breeds = ["Labrador Retriever", "Poodle", "German Shepherd Dog", "Beagle", "Golden Retriever", "Dachshund", "Pug",
      "Border Collie", "Shih Tzu", "Boxer", "Cocker Spaniel", "English Springer Spaniel", "Maine Coon", "Siamese", "Ragdoll",
      "British Shorthair", "Bengal", "Sphynx", "Norwegian Forest Cat", "Abyssinian"];
    expect(detectDelimited(breeds)).toBeNull();
    expect(detectHierarchy(breeds)).toBeNull();
  });

  it("two-word names that all share one space are words, not a key", () => {
    const names = ["English Setter", "English Pointer", "English Bulldog", "English Mastiff", "Irish Setter", "Irish Wolfhound",
      "Irish Terrier", "German Shepherd", "German Pinscher", "German Spitz", "Welsh Corgi", "Welsh Terrier"];
    expect(new Set(names.map((n) => n.split(" ")[0])).size).toBe(4); // first words would group them
    expect(detectHierarchy(names)).toBeNull();
  });

  it("sentences", () => {
    const notes = ["Booster given, no reaction.", "Owner reports limping since Tuesday.", "Follow-up in two weeks.",
      "Weight stable.", "Dental scale and polish; two extractions.", "Skin scrape negative.", "Ear infection, drops prescribed.",
      "Vaccination due next month.", "Nail trim only.", "Blood test: kidney values normal.", "Microchip scanned OK.", "Refused food for 2 days."];
    expect(detectHierarchy(notes)).toBeNull();
  });

  it("too few levels to judge", () => {
    expect(detectHierarchy(["00501", "00502", "00601"])).toBeNull();
    expect(detectHierarchy([])).toBeNull();
  });
});
