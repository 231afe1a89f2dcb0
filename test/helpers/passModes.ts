/**
 * Test helper: runs the one level pass in a forced mode and returns the level table, the totals
 * and which pass ran, so a test can compare the pass shapes on the same plan. Modes: "wide" and
 * "grouping" (TAILSIFT_PASS, read by engine/widePass), and "apart" — GROUPING SETS with the
 * numeric, time and content totals summed in their own statement (TAILSIFT_PASS_EXTRAS, read by
 * engine/passExtras); "grouping" keeps them inline; "unkeyed" is "grouping" with every extra an
 * aggregate, none a grouping key (TAILSIFT_PASS_KEYED=off, read by engine/keyedExtras).
 * `columns` is the SELECT list read from the level table.
 */
import { buildLevelTable, LEVEL_TABLE, type PassPlan, type PassTotals } from "../../src/engine/aggregate.js";
import type { Engine } from "../../src/engine/db.js";
import { extrasApart, wideExtrasApart } from "../../src/engine/passExtras.js";
import { useWidePass } from "../../src/engine/widePass.js";
import { splitKeyed } from "../../src/engine/keyedExtras.js";

export type PassMode = "wide" | "grouping" | "apart" | "unkeyed";

export async function passIn<Row>(engine: Engine, plan: PassPlan, mode: PassMode, columns: string): Promise<{ table: Row[]; totals: PassTotals; wide: boolean; apart: boolean }> {
  const before = { pass: process.env.TAILSIFT_PASS, extras: process.env.TAILSIFT_PASS_EXTRAS, keyed: process.env.TAILSIFT_PASS_KEYED };
  process.env.TAILSIFT_PASS = mode === "wide" ? "wide" : "grouping";
  process.env.TAILSIFT_PASS_EXTRAS = mode === "apart" ? "apart" : "inline";
  process.env.TAILSIFT_PASS_KEYED = mode === "unkeyed" ? "off" : "on";
  try {
    const wide = useWidePass(plan);
    const apart = wide ? wideExtrasApart(plan) : extrasApart(splitKeyed(plan).rest);
    const totals = await buildLevelTable(engine, plan);
    const table = await engine.rows<Row>(`SELECT ${columns} FROM ${LEVEL_TABLE} ORDER BY col, level NULLS FIRST, fold`, "reading the level table");
    return { table, totals, wide, apart };
  } finally {
    for (const [key, value] of [["TAILSIFT_PASS", before.pass], ["TAILSIFT_PASS_EXTRAS", before.extras], ["TAILSIFT_PASS_KEYED", before.keyed]] as const) {
      if (value === undefined) delete process.env[key];
      else process.env[key] = value;
    }
  }
}
