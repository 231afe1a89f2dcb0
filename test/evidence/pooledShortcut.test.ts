/**
 * The pooled target candidate of an identifier-like column whose largest level is below
 * minLevelRows has nothing to pool (every level would share "other"): it is null, read off the
 * column's count-of-counts without building the map of every level — checked by handing it an
 * engine that fails on any statement — and when some level does reach minLevelRows the
 * candidate is still scored. largestLevelRows is checked by hand on small count-of-counts.
 */
import { describe, expect, it } from "vitest";
import { DEFAULT_POLICY } from "../../src/advice/policy.js";
import type { Engine } from "../../src/engine/db.js";
import { largestLevelRows, pooledTargetCandidate } from "../../src/evidence/pooledTarget.js";
import type { ColumnProfile } from "../../src/profile/types.js";

const failing = new Proxy({}, { get: () => () => { throw new Error("no statement expected"); } }) as unknown as Engine;

describe("the pooled target candidate's empty case without SQL", () => {
  it("largestLevelRows is the largest count with levels", () => {
    expect(largestLevelRows([{ count: 1, levels: 900 }, { count: 2, levels: 40 }, { count: 7, levels: 1 }])).toBe(7);
    expect(largestLevelRows([{ count: 1, levels: 5 }, { count: 50, levels: 0 }])).toBe(1);
    expect(largestLevelRows([])).toBe(0);
  });

  it("returns null without a statement when no level reaches minLevelRows", async () => {
    const minRows = DEFAULT_POLICY.minLevelRows;
    const column = { name: "chip_id", role: "identifier", countOfCounts: [{ count: 1, levels: 5000 }, { count: minRows - 1, levels: 2 }] } as unknown as ColumnProfile;
    await expect(pooledTargetCandidate(failing, 0, column, "binary", DEFAULT_POLICY)).resolves.toBeNull();
  });

  it("still runs the statements when a level reaches minLevelRows", async () => {
    const column = { name: "chip_id", role: "identifier", countOfCounts: [{ count: 1, levels: 5000 }, { count: DEFAULT_POLICY.minLevelRows, levels: 1 }] } as unknown as ColumnProfile;
    await expect(pooledTargetCandidate(failing, 0, column, "binary", DEFAULT_POLICY)).rejects.toThrow("no statement expected");
  });
});
