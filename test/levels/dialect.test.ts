/** The Spark dialect of `tailsift sql`: backtick identifiers, STRING, backslash-escaped literals. */
import { describe, expect, it } from "vitest";
import { levelSql } from "../../src/commands/sql.js";

describe("levelSql dialects", () => {
  it("spark quotes identifiers with backticks and casts to STRING", () => {
    const sql = levelSql({ columns: ["we`ird col", "it's"], from: "lake.vet.t", target: "y", positive: "yes", dialect: "spark" });
    expect(sql).toContain("CAST(`we``ird col` AS STRING) AS v0");
    expect(sql).toContain("FROM `lake`.`vet`.`t`");
    expect(sql).toContain("SELECT 'it\\'s' AS `column`");
    expect(sql).not.toContain('"');
    expect(sql).not.toContain("VARCHAR");
  });

  it("ansi (the default) uses double quotes and VARCHAR", () => {
    const sql = levelSql({ columns: ["a"], from: "t" });
    expect(sql).toContain('CAST("a" AS VARCHAR) AS v0');
    expect(sql).not.toContain("`");
  });
});
