#!/usr/bin/env node
/**
 * cli.ts: commander wiring only. Every command calls the library API (index.ts); this file parses
 * options, prints results, and is the only place that prints errors and sets the exit code.
 */
import { realpathSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { Command, CommanderError, Option } from "commander";
import { decisions, engineOptions, fraction, integer, list, sourceOptions } from "./commands/commonOptions.js";
import { removeCreatedEmptyDirs, removePendingTemps } from "./commands/output.js";
import { noteSignal, outputsCommitted, signalExitCode, signalReceived } from "./runState.js";
import { progressEnabled, startProgress } from "./commands/progress.js";
import { runReport, runScan, type ScanCliOptions } from "./commands/scanCli.js";
import { toolVersion } from "./version.js";
import { addSqlCommand } from "./commands/sqlCli.js";
import { addDriftCommand } from "./commands/driftCli.js";
import { addEncodeCommand } from "./commands/encodeCli.js";
import type { Engine } from "./engine/db.js";
import { DEFAULT_FOLD_COUNT, DEFAULT_FOLD_SEED } from "./engine/folds.js";
import { DEFAULT_MAX_CLASSES } from "./engine/target.js";
import type { CliIO } from "./commands/io.js";
import { isTailsiftError } from "./errors.js";
import { refuseBlankOptions } from "./commands/optionChecks.js";

export type { CliIO };

export function buildProgram(io: CliIO): Command {
  const program = new Command();
  program
    .name("tailsift")
    .description("Measure every categorical column of a large extract in one pass, recommend an encoding with the numbers behind it, apply it leak-free and check newer extracts against the record.")
    .version(toolVersion(), "-V, --version")
    // commander's own errors are printed by runCli as one prefixed line
    .configureOutput({ writeOut: io.stdout, writeErr: io.stderr, outputError: () => {} })
    .exitOverride();

  const scan = program.command("scan")
    .description("profile every categorical column, recommend an encoding, print; --out DIR writes profile.json, decisions.md, report.html and levels.parquet")
    .argument("<inputs...>", "files (.csv, .tsv, .csv.gz, .parquet, .jsonl), globs or folders of Parquet")
    .option("--target <column>", "target column (binary, continuous or multi-class)")
    .option("--positive <value>", "the target value that counts as positive (binary)")
    .addOption(new Option("--target-kind <kind>", "force the target kind (multiclass: automatic for 3 to --max-classes text values; each class measured against the rest)").choices(["binary", "continuous", "multiclass"]))
    .option("--max-classes <n>", `most classes of a multi-class target (default ${DEFAULT_MAX_CLASSES})`, integer("--max-classes", 2))
    .option("--columns <names>", "profile only these columns (comma-separated, repeatable)", list)
    .option("--exclude <names>", "leave these columns out (comma-separated, repeatable)", list)
    .option("--as-categorical <names>", "profile these numeric-looking columns as levels", list)
    .option("--folds <k>", "folds for out-of-fold figures", integer("--folds"), DEFAULT_FOLD_COUNT)
    .option("--seed <n>", "seed of the fold assignment", integer("--seed"), DEFAULT_FOLD_SEED)
    .option("--fold-by <names>", "entity-grouped folds: hash these key columns (comma-separated) so every row of an entity shares a fold", list)
    .option("--time <column>", "time-ordered blocks: cut the rows, ordered by this date/time column, into --folds consecutive blocks; figures are also measured forward (fit on earlier blocks, score the next)")
    .option("--top <n>", "top levels listed per column", integer("--top", 1), 20)
    .option("--max-one-hot <n>", "widest one-hot block advised", integer("--max-one-hot"), 16)
    .option("--min-level-rows <n>", "rows a level needs for its own column", integer("--min-level-rows"), 30)
    .option("--coverage <share>", "row share pooled one-hot must cover", fraction("--coverage"), 0.95)
    .option("--collision-budget <share>", "largest colliding row share for hashing", fraction("--collision-budget"), 0.01)
    .option("--max-hash-bits <n>", "cap of the hash width: at most 2^n buckets (default 20)", integer("--max-hash-bits"))
    .option("--min-gain <share>", "share of the overall mean's out-of-fold loss a candidate must save (default 0.001)", fraction("--min-gain"))
    .option("--decide <column=encoding>", "override the advice for a column (repeatable)", decisions)
    .addOption(new Option("--format <format>", "output format").choices(["table", "json", "markdown"]).default("table"))
    .option("--out <dir>", "write profile.json, decisions.md, report.html and levels.parquet to this folder")
    .option("--redact", "replace level values in every output by a keyed hash prefix (key: TAILSIFT_REDACT_KEY, else random)")
    .option("--levels", "the inputs are level tables (Parquet or CSV) made by the query of tailsift sql: shards are added together and the folds are those of the table");
  engineOptions(sourceOptions(scan)).action(async (inputs: string[], opts: ScanCliOptions) => {
    const progress = startProgress("scanning", progressEnabled(opts));
    try {
      await runScan(inputs, opts, io, (e) => { progress.attach(e); io.onEngine?.(e); });
    } finally {
      progress.stop();
    }
  });

  program.command("report")
    .description("render a saved profile.json again as report.html, without rescanning")
    .argument("<profile>", "a profile.json written by scan --out")
    .requiredOption("--out <file>", "the HTML file to write")
    .option("--debug", "print the stack trace of an error")
    .action(async (profilePath: string, opts: { out: string }) => runReport(profilePath, opts.out, io));

  program.hook("preAction", (_root, action) => refuseBlankOptions(action));
  addEncodeCommand(program, io);
  addDriftCommand(program, io);
  addSqlCommand(program, io);
  return program;
}

/** Runs the CLI and returns the exit code (never exits the process itself). */
export async function runCli(argv: readonly string[], io: CliIO): Promise<number> {
  const program = buildProgram(io);
  try {
    await program.parseAsync([...argv], { from: "user" });
    return 0;
  } catch (err) {
    if (err instanceof CommanderError) {
      if (err.code === "commander.helpDisplayed" || err.code === "commander.version" || err.code === "commander.help") return 0;
      if (err.exitCode === 0) return 0;
      const reason = err.message.replace(/^error: /, "").split("\n")[0];
      io.stderr(`tailsift: ${reason} (run with --help for usage)\n`);
      return 2;
    }
    removeCreatedEmptyDirs(); // a failed run leaves no empty --out folder
    const debug = argv.includes("--debug");
    if (isTailsiftError(err)) {
      io.stderr(`tailsift: ${err.message}\n`);
      if (debug && err.stack) io.stderr(`${err.stack}\n`);
      return err.exitCode;
    }
    io.stderr(`tailsift: unexpected error: ${err instanceof Error ? err.message.split("\n")[0] : String(err)} (run with --debug for details)\n`);
    if (debug && err instanceof Error && err.stack) io.stderr(`${err.stack}\n`);
    return 2;
  }
}

function isMain(): boolean {
  const entry = process.argv[1];
  if (!entry) return false;
  try {
    return realpathSync(entry) === realpathSync(fileURLToPath(import.meta.url));
  } catch {
    return false;
  }
}

if (isMain()) {
  let engine: Engine | null = null;
  // A signal before the outputs are committed aborts the run (nothing new written, exit 130 /
  // 143); one after it is too late to undo, so the run finishes and says so (commands/runState).
  const onSignal = (signal: NodeJS.Signals) => {
    if (signalReceived()) { removePendingTemps(); removeCreatedEmptyDirs(); process.exit(signalExitCode(signal)); }
    noteSignal(signal);
    if (engine && !outputsCommitted()) engine.interrupt();
  };
  process.on("SIGINT", onSignal);
  process.on("SIGTERM", onSignal);
  const io: CliIO = {
    stdout: (t) => process.stdout.write(t),
    stderr: (t) => process.stderr.write(t),
    onEngine: (e) => { engine = e; if (e && signalReceived() && !outputsCommitted()) e.interrupt(); },
  };
  runCli(process.argv.slice(2), io).then((code) => {
    removePendingTemps();
    const signal = signalReceived();
    if (code !== 0) removeCreatedEmptyDirs();
    if (signal && code === 0) process.stderr.write(`tailsift: ${signal} came after the run had finished; its outputs are complete\n`);
    process.exitCode = signal && code !== 0 ? signalExitCode(signal) : code;
  }, (err: unknown) => {
    process.stderr.write(`tailsift: ${String(err)}\n`);
    process.exitCode = 2;
  });
}
