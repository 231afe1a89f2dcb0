/** The Spark dialect of `tailsift sql`: backtick identifiers, STRING, backslash-escaped literals. */
import { describe, expect, it } from "vitest";
import { levelSql } from "../../src/commands/sql.js";

describe("levelSql dialects", () => {
  it("spark quotes identifiers with backticks and casts to STRING", () => {
    const sql = levelSql({ columns: ["we`ird col", "it's"], from: "lake.vet.t", target: "y", positive: "yes", dialect: "spark" });
    expect(sql).toContain("CAST(`we``ird col` AS STRING) AS v");
    expect(sql).toContain("FROM `lake`.`vet`.`t`");
    expect(sql).toContain("SELECT 'it\\'s' AS `column`");
    expect(sql).not.toContain('"');
    expect(sql).not.toContain("VARCHAR");
  });

  it("ansi (the default) uses double quotes and VARCHAR", () => {
    const sql = levelSql({ columns: ["a"], from: "t" });
    expect(sql).toContain('CAST("a" AS VARCHAR) AS v');
    expect(sql).not.toContain("`");
  });

  it("ansi has no CTE and casts with DOUBLE PRECISION (PostgreSQL has no type DOUBLE)", () => {
    const sql = levelSql({ columns: ["a"], from: "t", target: "y", targetKind: "binary", foldExpr: "id", folds: 5 });
    expect(sql).not.toMatch(/\bWITH\b/);
    expect(sql).toContain("CAST(1 AS DOUBLE PRECISION)");
    expect(sql).not.toMatch(/AS DOUBLE\)/);
    expect(sql).toContain("CAST(MOD(ABS(id), 5) AS INTEGER)");
  });

  it("clickhouse (18.16) uses modulo, replaceRegexpAll, toFloat64 and Nullable(String), no CTE, MOD or TRIM", () => {
    const sql = levelSql({ columns: ["clinic"], from: "vet.visits", target: "no_show", targetKind: "binary", foldExpr: "row_id", folds: 5, dialect: "clickhouse" });
    expect(sql).not.toMatch(/\bWITH\b|\bMOD\(|\bTRIM\(|AS DOUBLE/);
    expect(sql).toContain("toInt32(modulo(abs(row_id), 5))");
    expect(sql).toContain("CAST(\"clinic\" AS Nullable(String))");
    expect(sql).toContain("replaceRegexpAll(CAST(\"no_show\" AS Nullable(String)), '^ +| +$', '')");
    expect(sql).toContain("toFloat64(1)");
    expect(sql).toContain('FROM "vet"."visits"');
  });
});
