/**
 * commands/encodeCli: the `tailsift encode` command — options, the library call, printing the
 * summary (a table on stderr unless --quiet, or JSON on stdout with --format json).
 */
import { type Command, Option } from "commander";
import { renderEncodeSummary } from "../encode/summaryTable.js";
import type { EncodeMode } from "../encode/types.js";
import { engineOptions, list, sourceOptions } from "./commonOptions.js";
import { encode } from "./encode.js";
import type { CliIO } from "./io.js";
import { progressEnabled, startProgress } from "./progress.js";

interface EncodeCliOptions {
  plan: string;
  out: string;
  for: EncodeMode;
  foldColumn: string;
  keep?: string[];
  keepOriginal?: boolean;
  leaveOneOut?: boolean;
  allClasses?: boolean;
  recount?: boolean;
  rawNames?: boolean;
  cellGuard: boolean;
  format: "table" | "json";
  memoryLimit?: string; threads?: number; tempDir?: string;
  skipBadRows?: boolean; encoding?: string; delimiter?: string; missingLike?: string[];
  quiet?: boolean; progress?: boolean; debug?: boolean;
}

/** Registers `tailsift encode` on `program`. */
export function addEncodeCommand(program: Command, io: CliIO): void {
  const cmd = program.command("encode")
    .description("apply the plan's encodings leak-free; writes FILE (.parquet, .csv, .tsv, optionally .gz) and FILE.mappings/ beside it")
    .argument("<inputs...>", "files (.csv, .tsv, .csv.gz, .parquet, .jsonl), globs or folders of Parquet")
    .requiredOption("--plan <profile>", "the profile.json written by scan --out (levels.parquet beside it), or its folder")
    .requiredOption("--out <file>", "the encoded output; the extension picks the format")
    .addOption(new Option("--for <use>", "training: out-of-fold target encoding and a fold column; scoring: full-data mappings with fallbacks for unseen levels")
      .choices(["training", "scoring"]).makeOptionMandatory())
    .option("--fold-column <name>", "name of the fold column written for training", "fold")
    .option("--keep <columns>", "pass these columns through untouched, e.g. keys and ids (comma-separated, repeatable)", list)
    .option("--keep-original", "also write each encoded column's text, as <column>__text")
    .option("--leave-one-out", "training: leave-one-out target encoding instead of out-of-fold")
    .option("--all-classes", "multi-class target: write one target-encoded column per class (default: all but the largest class, whose value is 1 − the others)")
    .option("--raw-names", "keep the raw output names (clinic=Yarrowby Vets 24) instead of safe ones (clinic_Yarrowby_Vets_24)")
    .option("--no-cell-guard", "CSV/TSV: write text cells starting with = + - @ (or tab, CR) as they are, without the ' prefix that keeps spreadsheets from running them; for machine-only pipelines")
    .option("--recount", "training: count level sums from the input even when it is the extract the plan was made from")
    .addOption(new Option("--format <format>", "summary format: table on stderr, or json on stdout").choices(["table", "json"]).default("table"));
  engineOptions(sourceOptions(cmd)).action(async (inputs: string[], o: EncodeCliOptions) => {
    const progress = startProgress("encoding", progressEnabled(o));
    let summary;
    try {
      summary = await encode(inputs, {
        plan: o.plan, out: o.out, mode: o.for, foldColumn: o.foldColumn,
        ...(o.keep ? { keep: o.keep } : {}), keepOriginal: o.keepOriginal ?? false,
        leaveOneOut: o.leaveOneOut ?? false, allClasses: o.allClasses ?? false, recount: o.recount ?? false,
        rawNames: o.rawNames ?? false, cellGuard: o.cellGuard,
        memoryLimit: o.memoryLimit, threads: o.threads, tempDir: o.tempDir,
        skipBadRows: o.skipBadRows, encoding: o.encoding, delimiter: o.delimiter, missingLike: o.missingLike,
        onEngine: (e) => { progress.attach(e); io.onEngine?.(e); },
      });
    } finally {
      progress.stop();
    }
    if (o.format === "json") io.stdout(`${JSON.stringify(summary, null, 2)}\n`);
    else if (!o.quiet) io.stderr(renderEncodeSummary(summary));
  });
}
