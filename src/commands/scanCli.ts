/**
 * commands/scanCli: what `tailsift scan` and `tailsift report` do around the library calls —
 * choose the output format, write the report folder atomically, print.
 */
import { randomUUID } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { DEFAULT_POLICY, validatePolicy, type AdvicePolicy } from "../advice/policy.js";
import type { Engine } from "../engine/db.js";
import type { FoldRequest } from "../engine/folds.js";
import { LEVEL_FILE_NAME } from "../engine/levelFile.js";
import { TailsiftError } from "../errors.js";
import { readPlan } from "../plan/load.js";
import { validateProfile } from "../profile/schema.js";
export { readProfile } from "../profile/readProfile.js";
import type { Encoding, Profile } from "../profile/types.js";
import { redactProfile } from "../profile/redact.js";
import { renderDecisionRecord } from "../render/markdown.js";
import { renderTable } from "../render/table.js";
import { shortenForReading, shortenForRecord } from "../render/shorten.js";
import { ensureOutputDir, keepCreatedDirs, pendingPathFor, pendingTemps, refuseInputAsOutput, removeStaleTemps, writeFileAtomic, writeFileSet } from "./output.js";
import { buildManifest, PLAN_MANIFEST } from "../plan/integrity.js";
import { commitOutputs, testPause, throwIfSignalled } from "../runState.js";
import { scanLevels, type LevelScanOptions } from "./levels.js";
import { scan } from "./scan.js";

export interface ScanCliOptions extends FoldRequest {
  target?: string; positive?: string; targetKind?: "binary" | "continuous" | "multiclass"; maxClasses?: number;
  columns?: string[]; exclude?: string[]; asCategorical?: string[];
  top: number; maxOneHot: number; minLevelRows: number; coverage: number; collisionBudget: number;
  /** --max-hash-bits: the hash width cap as a power of two (policy.hashMaxBits). */
  maxHashBits?: number;
  minGain?: number;
  decide?: Record<string, Encoding>;
  format: "table" | "json" | "markdown";
  out?: string;
  memoryLimit?: string; threads?: number; tempDir?: string;
  skipBadRows?: boolean; encoding?: string; delimiter?: string; missingLike?: string[];
  quiet?: boolean; progress?: boolean; debug?: boolean;
  /** The inputs are level tables (from the query of `tailsift sql`), not raw rows. */
  levels?: boolean;
  redact?: boolean;
}

interface IO { stdout: (t: string) => void; stderr: (t: string) => void }

/** The advice options the command line gives (scan and scan --levels alike). */
function policyOptions(o: ScanCliOptions): Partial<Omit<AdvicePolicy, "folds" | "seed">> {
  return {
    maxOneHot: o.maxOneHot, minLevelRows: o.minLevelRows, coverage: o.coverage, collisionBudget: o.collisionBudget,
    ...(o.minGain !== undefined ? { minGain: o.minGain } : {}), ...(o.maxHashBits !== undefined ? { hashMaxBits: o.maxHashBits } : {}),
  };
}

export async function runScan(inputs: string[], o: ScanCliOptions, io: IO, onEngine: (e: Engine | null) => void): Promise<void> {
  // the same check scan and scanLevels make, before the output folder exists: a bad option leaves nothing behind
  validatePolicy({ ...DEFAULT_POLICY, ...policyOptions(o) });
  if (o.out) {
    refuseInputAsOutput(o.out, inputs);
    ensureOutputDir(o.out);
    removeStaleTemps(o.out);
  }
  // levels.parquet is written to a pending temp name during the scan and moved in with the rest
  // of the set (writeReportFolder), so a failed run never pairs a new level table with an old profile
  const levelFinal = o.out && !o.redact ? path.join(o.out, LEVEL_FILE_NAME) : undefined;
  const levelTemp = levelFinal ? pendingPathFor(levelFinal) : undefined;
  if (levelTemp) pendingTemps.add(levelTemp);
  try {
    await scanAndWrite(inputs, o, io, onEngine, levelTemp);
  } finally {
    if (levelTemp) { fs.rmSync(levelTemp, { force: true }); pendingTemps.delete(levelTemp); }
  }
}

async function scanAndWrite(inputs: string[], o: ScanCliOptions, io: IO, onEngine: (e: Engine | null) => void, levelTemp: string | undefined): Promise<void> {
  // the command line's options are scan's own (target, columns, folds, source and engine options)
  const measured = o.levels ? await scanLevels(inputs, { ...levelScanOptions(o, onEngine), levelTableOut: levelTemp }) : await scan(inputs, {
    ...o, policy: policyOptions(o), levelTableOut: levelTemp, lockToPaths: [...inputs, ...(o.out ? [o.out] : [])], onEngine,
  });
  await testPause("after-pass", io.stderr);
  const profile = o.redact ? redactProfile(measured, process.env.TAILSIFT_REDACT_KEY || undefined) : measured;
  if (o.out) await writeReportFolder(profile, o.out, { levelTable: levelTemp, pause: () => testPause("before-commit", io.stderr) });
  else throwIfSignalled();
  if (o.format === "json") io.stdout(`${JSON.stringify(shortenForRecord(profile), null, 2)}\n`);
  else if (o.format === "markdown") io.stdout(renderDecisionRecord(shortenForReading(profile)));
  else io.stdout(renderTable(shortenForReading(profile)));
  if (o.out && !o.quiet) io.stderr(`wrote ${["profile.json", "decisions.md", "report.html", ...(o.redact ? [] : [LEVEL_FILE_NAME]), PLAN_MANIFEST].map((f) => path.join(o.out!, f)).join(", ")}\n`);
  await testPause("after-commit", io.stderr);
}

/** The HTML renderer loads vega and vega-lite (~0.4 s); load it only when a report is written. */
async function htmlReport(profile: Profile): Promise<string> {
  const { renderHtmlReport } = await import("../render/html.js");
  return renderHtmlReport(profile);
}

/**
 * Writes profile.json, decisions.md, report.html and plan-manifest.json (and levels.parquet when
 * `levelTable` names the finished table file to move in) as one set: see plan/integrity. A set
 * without a level table removes an old levels.parquet from the folder.
 */
export async function writeReportFolder(profile: Profile, dir: string, options: { levelTable?: string; pause?: () => Promise<void> } = {}): Promise<void> {
  validateProfile(profile);
  const reading = shortenForReading(profile);
  const html = await htmlReport(reading);
  await options.pause?.();
  const planId = randomUUID();
  const files = [
    { name: "profile.json", content: `${JSON.stringify({ ...shortenForRecord(profile), planId }, null, 2)}\n` },
    { name: "decisions.md", content: renderDecisionRecord(reading) },
    { name: "report.html", content: html },
    ...(options.levelTable ? [{ name: LEVEL_FILE_NAME, from: options.levelTable }] : []),
  ];
  writeFileSet(dir, files, (staged) => ({ name: PLAN_MANIFEST, content: `${JSON.stringify(buildManifest(staged, planId), null, 2)}\n` }),
    options.levelTable ? [] : [LEVEL_FILE_NAME], (renames) => commitOutputs(renames));
  keepCreatedDirs();
}


export async function runReport(profilePath: string, out: string, io: IO): Promise<void> {
  const { profile, profilePath: file } = readPlan(profilePath, "report", false);
  refuseInputAsOutput(out, [file]);
  ensureOutputDir(path.dirname(path.resolve(out)));
  writeFileAtomic(out, await htmlReport(shortenForReading(profile)));
  io.stderr(`wrote ${out}\n`);
}

/**
 * `scan --levels`: maps the scan command's options onto scanLevels. Options about reading raw
 * rows (--as-categorical, --skip-bad-rows, --encoding) are refused; --delimiter applies to CSV
 * level tables; --folds only matters for a one-fold table (the K recorded for target-kfold).
 */
export function levelScanOptions(o: ScanCliOptions, onEngine: (e: Engine | null) => void): LevelScanOptions {
  const refused = [o.foldBy !== undefined ? "--fold-by" : "", o.time !== undefined ? "--time" : "", o.asCategorical?.length ? "--as-categorical" : "", o.skipBadRows ? "--skip-bad-rows" : "", o.encoding ? "--encoding" : "", o.missingLike?.length ? "--missing-like (give it to tailsift sql)" : ""].filter((x) => x);
  if (refused.length > 0) throw new TailsiftError("bad_option", `${refused.join(", ")} do${refused.length === 1 ? "es" : ""} not apply to --levels: level tables are already counted`);
  return { ...o, policy: policyOptions(o), levelTableOut: o.out && !o.redact ? path.join(o.out, LEVEL_FILE_NAME) : undefined, onEngine };
}
