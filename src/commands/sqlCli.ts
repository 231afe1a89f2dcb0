/**
 * commands/sqlCli: `tailsift sql` — prints the level-aggregation query for another SQL engine.
 * Reads no data: the query's output, saved as Parquet or CSV, goes to `tailsift scan --levels`.
 */
import { type Command, Option } from "commander";
import { integer, list } from "./commonOptions.js";
import type { CliIO } from "./io.js";
import { levelSql, type LevelSqlOptions } from "./sql.js";
import { scoringQuery } from "../portableSql/scoringCommand.js";
import { TailsiftError } from "../errors.js";
import { readPlan } from "../plan/load.js";

/** The command's options: the query options, with --columns optional until checked. */
type SqlCliOptions = Omit<LevelSqlOptions, "columns"> & { columns?: string[]; plan?: string; inlineMax?: number; mappingsOut?: string; rawNames?: boolean };

/** Registers `tailsift sql` on the program. */
export function addSqlCommand(program: Command, io: CliIO): void {
  program.command("sql")
    .description("print the portable SQL that builds the level table (column, level, fold, rows, n_y, sum_y, sum_y2) in another engine; save its result as Parquet or CSV and run scan --levels on it. With --plan: the SQL that applies the plan's scoring encodings to a table, as encode --for scoring does")
    .option("--columns <names>", "columns whose levels are counted (comma-separated, repeatable; needed without --plan)", list)
    .option("--plan <dir>", "print the scoring SQL of this plan (profile.json + levels.parquet from scan --out) instead of the level-table SQL")
    .option("--inline-max <n>", "with --plan: mappings of at most N rows are inlined in the SQL (default 64); larger ones are tables to load", integer("--inline-max"))
    .option("--mappings-out <dir>", "with --plan: new folder for the CSV files (level,value) of the mapping tables that are not inlined")
    .option("--raw-names", "with --plan: name the output columns as encode --raw-names does (clinic=Yarrowby Vets 24) instead of encode's safe names (clinic_Yarrowby_Vets_24)")
    .requiredOption("--from <table>", "the table to read: TABLE or db.schema.table (each part is quoted)")
    .option("--target <column>", "target column (binary or continuous)")
    .option("--positive <value>", "the target value that counts as 1; any other non-blank value is 0 (binary)")
    .addOption(new Option("--target-kind <kind>", "how y is made: binary (1 = 1/1.0/true/t/yes/y, 0 = 0/0.0/false/f/no/n, else missing) or continuous (CAST AS DOUBLE); needed with --target unless --positive is given").choices(["binary", "continuous"]))
    .option("--fold-expr <sql>", "SQL expression giving each row's fold (e.g. a hash of a row key modulo K); without it every row is fold 0 and scan --levels cannot compute out-of-fold figures")
    .option("--folds <k>", "wrap the fold expression as MOD(ABS(expr), K)", integer("--folds"))
    .addOption(new Option("--dialect <name>", "how the SQL is spelled: ansi (DuckDB, PostgreSQL, Trino), spark (backticks, STRING) or clickhouse (modulo, toFloat64, Nullable(String); no CTE)").choices(["ansi", "spark", "clickhouse"]).default("ansi"))
    .option("--missing-like <values>", "count these values as missing (NULL), trimmed and case-insensitive, as scan --missing-like does (comma-separated, repeatable; level-table SQL only)", list)
    .option("--debug", "print the stack trace of an error")
    .action(async (opts: SqlCliOptions) => {
      if (opts.plan !== undefined) {
        const misplaced = [opts.columns ? "--columns" : "", opts.target ? "--target" : "", opts.positive ? "--positive" : "", opts.targetKind ? "--target-kind" : "", opts.foldExpr ? "--fold-expr" : "", opts.folds !== undefined ? "--folds" : "", opts.missingLike ? "--missing-like" : ""].filter((x) => x);
        if (misplaced.length > 0) throw new TailsiftError("bad_option", `${misplaced.join(", ")} do not apply with --plan: the plan says what is encoded`);
        refuseClassEncodings(opts.plan);
        const { sql } = await scoringQuery({ plan: opts.plan, from: opts.from, dialect: opts.dialect, inlineMax: opts.inlineMax, mappingsOut: opts.mappingsOut, rawNames: opts.rawNames });
        io.stdout(`${sql.trimEnd()};\n`);
        return;
      }
      if (opts.inlineMax !== undefined || opts.mappingsOut !== undefined || opts.rawNames) throw new TailsiftError("bad_option", "--inline-max, --mappings-out and --raw-names apply with --plan");
      const sql = levelSql({
        columns: opts.columns ?? [], from: opts.from, target: opts.target, positive: opts.positive,
        targetKind: opts.targetKind, foldExpr: opts.foldExpr, folds: opts.folds, dialect: opts.dialect,
        ...(opts.missingLike ? { missingLike: opts.missingLike } : {}),
      });
      io.stdout(`${sql.trimEnd()};\n`);
    });
}

/** The portable scoring SQL has no multi-class target encoding yet: such a plan is refused in one line. */
function refuseClassEncodings(plan: string): void {
  const { profile } = readPlan(plan, "sql", false);
  const encoded = profile.columns.filter((c) => c.recommendation.encoding === "target-kfold" && "classes" in c.recommendation.params && c.recommendation.params.classes !== undefined).map((c) => c.name);
  if (encoded.length > 0) {
    throw new TailsiftError("unsupported_plan", `sql --plan cannot yet write the multi-class target encoding of ${encoded.map((c) => `'${c}'`).join(", ")}; use encode --for scoring, or rescan with --decide ${encoded[0]}=one-hot (or another encoding)`);
  }
}
