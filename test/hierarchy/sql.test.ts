/**
 * Hierarchy figures computed in DuckDB over every level, checked against plain TypeScript
 * computations over the generated rows (group counts, well-filled share, median group size, the
 * backoff cascade, hash collisions of the groups with node:crypto), plus parentSql ≡ parentOf.
 */
import { createHash } from "node:crypto";
import fs from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEFAULT_POLICY } from "../../src/advice/policy.js";
import { scan } from "../../src/commands/scan.js";
import { withEngine } from "../../src/engine/db.js";
import { quoteLiteral } from "../../src/engine/sql.js";
import { applyHierarchy } from "../../src/hierarchy/applyHierarchy.js";
import { hierarchyFor } from "../../src/hierarchy/hierarchyFor.js";
import { parentOf, parentSql } from "../../src/hierarchy/parent.js";
import type { HierarchyFigures, ParentSpec } from "../../src/hierarchy/types.js";
import type { Profile } from "../../src/profile/types.js";
import { csv, withLevelTable } from "../evidence/helpers.js";
import { mulberry32, tempDir, writeFile } from "../helpers/tmp.js";
import { backoffGroups, counts, median } from "./plain.js";

const dir = tempDir("hierarchy");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

it("parentSql agrees with parentOf on awkward levels", async () => {
  const levels = ["A-B@7", "A-B", "A", "-A-B", "A--B@", "", "A@B-C@D", "00501", "7", "a/b.c d", "x y", "é-ü@1"];
  const specs: ParentSpec[] = [
    { kind: "prefix", length: 1 }, { kind: "prefix", length: 3 },
    ...[1, 2, 3].map((count): ParentSpec => ({ kind: "tokens", count, delimiters: "-@" })),
    { kind: "tokens", count: 2, delimiters: "/. " },
  ];
  await withEngine({ threads: 1 }, async (engine) => {
    const values = levels.map((l) => `(${quoteLiteral(l)})`).join(", ");
    for (const spec of specs) {
      const rows = await engine.rows<{ level: string; parent: string }>(`SELECT level, ${parentSql(spec, "level")} AS parent FROM (VALUES ${values}) t(level)`, "test");
      for (const r of rows) expect(r.parent, `${JSON.stringify(spec)} of '${r.level}'`).toBe(parentOf(spec, r.level));
    }
  });
});

describe("figures over a generated extract", () => {
  // 3,000 rows. code: 60 zero-padded districts "0DD" × 2 random digits (postcode-like, mostly seen once);
  // key: "X-YY@DD" composite keys; counter: "R" + 7-digit row number (sequential).
  const rand = mulberry32(21);
  const digit = () => String(Math.floor(rand() * 10));
  const districts = Array.from({ length: 60 }, (_, i) => `0${String(i + 20).padStart(2, "0")}`);
  const rows = Array.from({ length: 3000 }, (_, i) => {
    const code = `${districts[Math.floor(rand() * 60)]}${digit()}${digit()}`;
    const key = `${"ABCDE".charAt(Math.floor(rand() * 5))}-${"PQRS".charAt(Math.floor(rand() * 4))}${"KLMN".charAt(Math.floor(rand() * 4))}@${digit()}${digit()}`;
    return [i, code, key, `R${String(i + 1).padStart(7, "0")}`];
  });
  const file = writeFile(dir, "codes.csv", csv(["id", "code", "key", "counter"], rows));
  let profile: Profile;
  let hierarchy: Map<number, HierarchyFigures>;
  const names = ["code", "key", "counter"];
  beforeAll(async () => {
    profile = await scan([file], { columns: names });
    const columns = names.map((n) => profile.columns.find((c) => c.name === n)!);
    hierarchy = await withLevelTable(file, names, undefined, ({ engine }) => hierarchyFor(engine, columns, DEFAULT_POLICY));
  });

  it.each([["code", 1], ["key", 2]] as const)("%s: every parent's groups, well-filled share and median equal a plain count", (name, index) => {
    const h = hierarchy.get(names.indexOf(name))!;
    expect(h).toBeDefined();
    const levels = counts(rows.map((r) => String(r[index])));
    for (const f of h.parents) {
      const groups = counts([...levels].flatMap(([level, n]) => Array<string>(n).fill(parentOf(f.parent, level))));
      const sizes = [...groups.values()];
      expect(f.groups).toBe(groups.size);
      expect(f.wellFilledRowShare).toBeCloseTo(sizes.filter((s) => s >= 30).reduce((a, b) => a + b, 0) / rows.length, 12);
      expect(f.medianGroupRows).toBe(median(sizes));
    }
  });

  it("code: postcode-like identifier, backoff to the 3-digit district covers the rows", () => {
    const h = hierarchy.get(0)!;
    expect(profile.columns.find((c) => c.name === "code")?.role).toBe("identifier");
    expect(h.pattern).toBe("fixed-length");
    expect(h.shape).toBe("DDDDD");
    const plain = backoffGroups(counts(rows.map((r) => String(r[1]))), h.parents.map((p) => p.parent), 30);
    expect(h.backoff.groups).toBe(plain.groups.size);
    expect(h.backoff.coverage).toBeCloseTo(plain.coverage, 12);
    expect(h.backoff.parentRowShare).toBeCloseTo(plain.parentShare, 12);
    expect(h.priorParent).toEqual({ kind: "prefix", length: 3 }); // 60 districts × ~50 rows
    expect(h.useful).toBe(true);
    expect(h.counterLike).toBe(false);
  });

  it("code without a target: backoff grouping then hashing (groups past the cap), collisions as node:crypto counts them", () => {
    const column = profile.columns.find((c) => c.name === "code")!;
    const h = hierarchy.get(0)!;
    // within the default cap the groups are indexed (codes); a cap below the group count hashes them
    expect(applyHierarchy(column, h, DEFAULT_POLICY)).toMatchObject({ encoding: "codes", params: { grouping: "backoff", tableSize: h.backoff.groups } });
    const bits = Math.floor(Math.log2(h.backoff.groups - 1));
    expect(2 ** bits).toBeLessThan(h.backoff.groups);
    const rec = applyHierarchy(column, h, { ...DEFAULT_POLICY, hashMaxBits: bits });
    expect(rec.encoding).toBe("hashing");
    expect(rec.params).toMatchObject({ grouping: "backoff", minRows: 30, width: h.backoff.hashing!.width });
    const plain = backoffGroups(counts(rows.map((r) => String(r[1]))), h.parents.map((p) => p.parent), 30);
    const width = BigInt(h.backoff.hashing!.width);
    const buckets = new Map<bigint, { groups: number; rows: number }>();
    for (const [key, n] of plain.groups) {
      const b = createHash("md5").update(key.split("\u0000")[1]!).digest().readBigUInt64LE(0) % width; // engine/hashing's definition
      const prev = buckets.get(b) ?? { groups: 0, rows: 0 };
      buckets.set(b, { groups: prev.groups + 1, rows: prev.rows + n });
    }
    const colliding = [...buckets.values()].filter((b) => b.groups > 1).reduce((s, b) => s + b.rows, 0);
    const grouped = [...plain.groups.values()].reduce((a, b) => a + b, 0);
    expect(h.backoff.hashing!.collisionRowShare).toBeCloseTo(colliding / grouped, 12);
    expect(h.backoff.hashing!.collisionRowShare).toBeLessThanOrEqual(DEFAULT_POLICY.collisionBudget);
    expect(rec.reasons.join(" ")).toMatch(/groups cover/);
  });

  it("counter: sequential ids are counter-like, so the rules' drop stands", () => {
    const h = hierarchy.get(2)!;
    const column = profile.columns.find((c) => c.name === "counter")!;
    expect(h.counterLike).toBe(true);
    expect(h.useful).toBe(false);
    expect(applyHierarchy(column, h, DEFAULT_POLICY)).toBe(column.recommendation);
    expect(column.recommendation.encoding).toBe("drop");
  });
});
