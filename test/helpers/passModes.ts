/**
 * Test helper: runs the one level pass in a forced mode (TAILSIFT_PASS=wide | grouping, the hook
 * engine/widePass reads) and returns the level table, the totals and which pass ran, so a test can
 * compare the two passes on the same plan. `columns` is the SELECT list read from the level table.
 */
import { buildLevelTable, LEVEL_TABLE, type PassPlan, type PassTotals } from "../../src/engine/aggregate.js";
import type { Engine } from "../../src/engine/db.js";
import { useWidePass } from "../../src/engine/widePass.js";

export async function passIn<Row>(engine: Engine, plan: PassPlan, mode: "wide" | "grouping", columns: string): Promise<{ table: Row[]; totals: PassTotals; wide: boolean }> {
  const before = process.env.TAILSIFT_PASS;
  process.env.TAILSIFT_PASS = mode;
  try {
    const wide = useWidePass(plan);
    const totals = await buildLevelTable(engine, plan);
    const table = await engine.rows<Row>(`SELECT ${columns} FROM ${LEVEL_TABLE} ORDER BY col, level NULLS FIRST, fold`, "reading the level table");
    return { table, totals, wide };
  } finally {
    if (before === undefined) delete process.env.TAILSIFT_PASS;
    else process.env.TAILSIFT_PASS = before;
  }
}
