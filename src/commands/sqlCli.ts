/**
 * commands/sqlCli: `tailsift sql` — prints the level-aggregation query for another SQL engine.
 * Reads no data: the query's output, saved as Parquet or CSV, goes to `tailsift scan --levels`.
 */
import path from "node:path";
import { type Command, Option } from "commander";
import type { Engine } from "../engine/db.js";
import { LEVEL_FILE_NAME } from "../engine/levelFile.js";
import { TailsiftError } from "../errors.js";
import { integer, list } from "./commonOptions.js";
import type { CliIO } from "./io.js";
import type { LevelScanOptions } from "./levels.js";
import type { ScanCliOptions } from "./scanCli.js";
import { levelSql, type LevelSqlOptions } from "./sql.js";

/** The command's options: the query options, with --columns optional until checked. */
type SqlCliOptions = Omit<LevelSqlOptions, "columns"> & { columns?: string[] };

/** Registers `tailsift sql` on the program. */
export function addSqlCommand(program: Command, io: CliIO): void {
  program.command("sql")
    .description("print the portable SQL that builds the level table (column, level, fold, rows, n_y, sum_y, sum_y2) in another engine; save its result as Parquet or CSV and run scan --levels on it")
    .requiredOption("--columns <names>", "columns whose levels are counted (comma-separated, repeatable)", list)
    .requiredOption("--from <table>", "the table to read: TABLE or db.schema.table (each part is quoted)")
    .option("--target <column>", "target column (binary or continuous)")
    .option("--positive <value>", "the target value that counts as 1; any other non-blank value is 0 (binary)")
    .addOption(new Option("--target-kind <kind>", "how y is made: binary (1 = 1/1.0/true/t/yes/y, 0 = 0/0.0/false/f/no/n, else missing) or continuous (CAST AS DOUBLE); needed with --target unless --positive is given").choices(["binary", "continuous"]))
    .option("--fold-expr <sql>", "SQL expression giving each row's fold (e.g. a hash of a row key modulo K); without it every row is fold 0 and scan --levels cannot compute out-of-fold figures")
    .option("--folds <k>", "wrap the fold expression as MOD(ABS(expr), K)", integer("--folds"))
    .addOption(new Option("--dialect <name>", "identifier and string quoting: ansi (DuckDB, Trino, PostgreSQL) or spark (backticks, STRING)").choices(["ansi", "spark"]).default("ansi"))
    .option("--missing-like <values>", "count these values as missing (NULL), trimmed and case-insensitive, as scan --missing-like does (comma-separated, repeatable)", list)
    .option("--debug", "print the stack trace of an error")
    .action((opts: SqlCliOptions & { missingLike?: string[] }) => {
      const sql = levelSql({
        columns: opts.columns ?? [], from: opts.from, target: opts.target, positive: opts.positive,
        targetKind: opts.targetKind, foldExpr: opts.foldExpr, folds: opts.folds, dialect: opts.dialect,
        ...(opts.missingLike ? { missingLike: opts.missingLike } : {}),
      });
      io.stdout(`${sql.trimEnd()};\n`);
    });
}

/**
 * `scan --levels`: maps the scan command's options onto scanLevels. Options about reading raw
 * rows (--as-categorical, --skip-bad-rows, --encoding) are refused; --delimiter applies to CSV
 * level tables; --folds only matters for a one-fold table (the K recorded for target-kfold).
 */
export function levelScanOptions(o: ScanCliOptions, onEngine: (e: Engine | null) => void): LevelScanOptions {
  const refused = [o.asCategorical?.length ? "--as-categorical" : "", o.skipBadRows ? "--skip-bad-rows" : "", o.encoding ? "--encoding" : "", o.missingLike?.length ? "--missing-like (give it to tailsift sql)" : ""].filter((x) => x);
  if (refused.length > 0) throw new TailsiftError("bad_option", `${refused.join(", ")} do${refused.length === 1 ? "es" : ""} not apply to --levels: level tables are already counted`);
  return {
    target: o.target, positive: o.positive, targetKind: o.targetKind, columns: o.columns, exclude: o.exclude, top: o.top,
    policy: { folds: o.folds, seed: o.seed, maxOneHot: o.maxOneHot, minLevelRows: o.minLevelRows, coverage: o.coverage, collisionBudget: o.collisionBudget },
    decide: o.decide, memoryLimit: o.memoryLimit, threads: o.threads, tempDir: o.tempDir, delimiter: o.delimiter,
    levelTableOut: o.out && !o.redact ? path.join(o.out, LEVEL_FILE_NAME) : undefined, onEngine,
  };
}
