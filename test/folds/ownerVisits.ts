/**
 * A generated veterinary-clinic visit log with repeated owners (invented data): each owner has
 * many visits, a pet whose name (mostly unique, a few shared) follows the owner (a level almost always used by one owner only),
 * a preferred payment that follows the owner but is shared by many owners, and a no-show target
 * driven by the owner (owner-level signal) plus noise. Seeded, so every run writes the same file.
 */
import { mulberry32 } from "../helpers/tmp.js";

const FIRST = ["Bis", "Pep", "Mo", "Lu", "Ro", "Zig", "Tof", "Nu", "Wal", "Cle", "Fen", "Gus", "Ha", "Ivo", "Ja", "Kip", "Lo", "Mir", "Nox", "Ori"];
const SECOND = ["cuit", "per", "chi", "na", "ly", "gy", "fee", "tmeg", "do", "o", "nel", "to", "zel", "ry", "sper", "pa", "la", "ko", "bie", "tz"];
const PAYMENTS = ["card", "cash", "insurance", "invoice"];
const SPECIES = ["dog", "cat", "rabbit", "bird"];

export interface OwnerVisits { header: string[]; rows: string[][]; csv: string }

/** `owners` owners with 4 to 14 visits each. */
export function ownerVisits(owners = 240, seed = 15): OwnerVisits {
  const random = mulberry32(seed);
  const header = ["visit_id", "owner_id", "pet_name", "payment", "species", "no_show"];
  const rows: string[][] = [];
  const used = new Set<string>();
  for (let o = 0; o < owners; o += 1) {
    // a pet name unique to the owner (two syllables plus, when taken, a number); about 2 % of
    // owners call their pet "Bella", a name several owners share
    const shared = random() < 0.02;
    let name = FIRST[Math.floor(random() * FIRST.length)]! + SECOND[Math.floor(random() * SECOND.length)]!;
    for (let n = 2; used.has(name); n += 1) name = `${name.replace(/ \d+$/, "")} ${n}`;
    used.add(name);
    if (shared) name = "Bella";
    const payment = PAYMENTS[Math.floor(random() * PAYMENTS.length)]!;
    const propensity = [0.05, 0.2, 0.5, 0.85][Math.floor(random() * 4)]!; // the owner-level signal
    const visits = 4 + Math.floor(random() * 11);
    for (let v = 0; v < visits; v += 1) {
      const species = SPECIES[Math.floor(random() * SPECIES.length)]!;
      rows.push([`V${rows.length + 1}`, `O${String(o + 1).padStart(4, "0")}`, name, payment, species, random() < propensity ? "1" : "0"]);
    }
  }
  return { header, rows, csv: [header.join(","), ...rows.map((r) => r.join(","))].join("\n") + "\n" };
}
