/**
 * commands/sqlCli: `tailsift sql` — prints the level-aggregation query for another SQL engine.
 * Reads no data: the query's output, saved as Parquet or CSV, goes to `tailsift scan --levels`.
 */
import { type Command, Option } from "commander";
import { integer, list } from "./commonOptions.js";
import type { CliIO } from "./io.js";
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
    .option("--debug", "print the stack trace of an error")
    .action((opts: SqlCliOptions) => {
      const sql = levelSql({
        columns: opts.columns ?? [], from: opts.from, target: opts.target, positive: opts.positive,
        targetKind: opts.targetKind, foldExpr: opts.foldExpr, folds: opts.folds, dialect: opts.dialect,
      });
      io.stdout(`${sql.trimEnd()};\n`);
    });
}
