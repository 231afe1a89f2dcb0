/**
 * The sample that classifies columns reads the FIRST rows of the input (engine/inspect, LIMIT
 * SAMPLE_ROWS). scan lets DuckDB drop row order only for the pass after it: before, the sample
 * ran without order, so on a multi-threaded read it could take any 50,000 rows and the record
 * (the sampled distinct count below, and with it the column's classification) changed from run
 * to run on the same file.
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { scan } from "../../src/commands/scan.js";
import { withEngine } from "../../src/engine/db.js";
import { quoteLiteral } from "../../src/engine/sql.js";
import { SAMPLE_ROWS } from "../../src/engine/inspect.js";
import { tempDir } from "../helpers/tmp.js";

const dir = tempDir("sample-order");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

describe("the classification sample is the first rows, whatever the threads", () => {
  it("a numeric column with 40 values in the first rows and new values later", async () => {
    const file = path.join(dir, "fees.csv");
    const rows = 6 * SAMPLE_ROWS;
    // the first SAMPLE_ROWS rows repeat 40 fees; every later row has a fee of its own
    const lines = ["visit,clinic,fee"];
    for (let i = 0; i < rows; i++) lines.push(`V${i},Clinic ${i % 7},${i < SAMPLE_ROWS ? (i % 40) + 0.5 : i + 0.25}`);
    fs.writeFileSync(file, `${lines.join("\n")}\n`);
    // the same rows as Parquet in many row groups, which DuckDB reads on several threads
    const parquet = path.join(dir, "fees.parquet");
    await withEngine({ threads: 1 }, (e) => e.run(`COPY (SELECT * FROM read_csv(${quoteLiteral(file)}, all_varchar = true)) TO ${quoteLiteral(parquet)} (FORMAT parquet, ROW_GROUP_SIZE 10000)`, "writing the Parquet copy"));
    for (const input of [file, parquet, file, parquet, parquet]) {
      const p = await scan([input], { threads: 2 });
      const fee = p.columns.find((c) => c.name === "fee")!;
      expect(fee.numericValues).toMatchObject({ distinct: 40, exact: false, sampledRows: SAMPLE_ROWS });
    }
  }, 120_000);
});
