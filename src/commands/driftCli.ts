/**
 * commands/driftCli: the `tailsift drift` command — options, the library call, printing. When
 * any column's status is `act` it throws a TailsiftError with exit code 1 after printing the
 * report, so runCli exits 1; bad input exits 2 through the library's own errors.
 */
import { type Command, Option } from "commander";
import type { DriftThresholds } from "../drift/types.js";
import { TailsiftError } from "../errors.js";
import { renderDriftMarkdown, renderDriftTable } from "../render/driftTable.js";
import { engineOptions, fraction, sourceOptions } from "./commonOptions.js";
import { drift } from "./drift.js";
import type { CliIO } from "./io.js";
import { progressEnabled, startProgress } from "./progress.js";

interface DriftCliOptions extends DriftThresholds {
  plan: string;
  format: "table" | "json" | "markdown";
  memoryLimit?: string; threads?: number; tempDir?: string;
  skipBadRows?: boolean; encoding?: string; delimiter?: string; missingLike?: string[];
  quiet?: boolean; progress?: boolean; debug?: boolean;
}

/**
 * Registers `tailsift drift <inputs...> --plan profile.json`: prints the report (table, json or
 * markdown) to io.stdout, then throws TailsiftError("drift_act", …, 1) when any column is act.
 */
export function addDriftCommand(program: Command, io: CliIO): void {
  const cmd = program.command("drift")
    .description("check a newer extract against a saved plan: unseen-level share against the forecast, PSI, target-rate shift; exit 1 when a column needs action")
    .argument("<inputs...>", "files (.csv, .tsv, .csv.gz, .parquet, .jsonl), globs or folders of Parquet")
    .requiredOption("--plan <profile>", "the profile.json written by scan --out (levels.parquet beside it), or its folder")
    .addOption(new Option("--format <format>", "output format").choices(["table", "json", "markdown"]).default("table"))
    .option("--psi-watch <x>", "PSI at which a column is watch", fraction("--psi-watch"), 0.1)
    .option("--psi-act <x>", "PSI at which a column is act", fraction("--psi-act"), 0.25)
    .option("--unseen-act-ratio <x>", "unseen share, as a multiple of the forecast, that is act", fraction("--unseen-act-ratio"), 3)
    .option("--unseen-act-min <share>", "smallest unseen share that can be act", fraction("--unseen-act-min"), 0.01)
    .option("--effect-act <x>", "effect size (Cohen's h or d) of a level's target shift that is act", fraction("--effect-act"), 0.5);
  engineOptions(sourceOptions(cmd)).action(async (inputs: string[], o: DriftCliOptions) => {
    const progress = startProgress("checking drift", progressEnabled(o));
    let report;
    try {
      report = await drift(inputs, o.plan, {
        thresholds: { psiWatch: o.psiWatch, psiAct: o.psiAct, unseenActRatio: o.unseenActRatio, unseenActMin: o.unseenActMin, effectAct: o.effectAct },
        memoryLimit: o.memoryLimit, threads: o.threads, tempDir: o.tempDir,
        skipBadRows: o.skipBadRows, encoding: o.encoding, delimiter: o.delimiter, missingLike: o.missingLike,
        onEngine: (e) => { progress.attach(e); io.onEngine?.(e); },
      });
    } finally {
      progress.stop();
    }
    if (o.format === "json") io.stdout(`${JSON.stringify(report, null, 2)}\n`);
    else if (o.format === "markdown") io.stdout(renderDriftMarkdown(report));
    else io.stdout(renderDriftTable(report));
    const acting = report.columns.filter((c) => c.status === "act").map((c) => c.name);
    if (acting.length > 0) {
      throw new TailsiftError("drift_act", `drift: ${acting.length} column${acting.length === 1 ? "" : "s"} need${acting.length === 1 ? "s" : ""} action (${acting.join(", ")})`, 1);
    }
  });
}
