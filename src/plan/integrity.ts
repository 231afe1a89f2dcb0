/**
 * plan/integrity: a plan folder (profile.json, decisions.md, report.html, levels.parquet) is one
 * set. `scan --out` gives each written set a plan id, stored in profile.json (`planId`) and in
 * a manifest beside it, plan-manifest.json, with the SHA-256 of every file of the set. The
 * manifest is renamed into place FIRST, before the files, so at every moment of a write (and
 * after a write that died half-way) a reader finds the old set, the new set, or files that
 * disagree with the manifest — refused, never used as a mix.
 *
 * verifyPlanSet is the one check, called by every plan reader (encode, drift, report):
 * profile.json must carry the manifest's plan id (its bytes are not compared: editing a
 * column's parameters by hand is a supported way to change a plan) and levels.parquet must have
 * the manifest's SHA-256, or be absent when the manifest lists none (a redacted scan).
 * decisions.md and report.html are listed but not enforced (`tailsift report` renders them
 * again). A folder without a manifest (written before manifests existed, or by the library's
 * scan() with levelTableOut) is read as before: nothing ties its files together.
 */
import { createHash, randomUUID } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { TailsiftError } from "../errors.js";

export const PLAN_MANIFEST = "plan-manifest.json";
export const MANIFEST_FORMAT = "tailsift-plan-set/1";
const LEVELS = "levels.parquet";

export interface PlanManifest {
  format: typeof MANIFEST_FORMAT;
  planId: string;
  /** File name → "sha256:<hex>" of its content. */
  files: Record<string, string>;
}

/** SHA-256 of a file's bytes, read in 1 MiB pieces. */
export function sha256File(file: string): string {
  const hash = createHash("sha256");
  const fd = fs.openSync(file, "r");
  try {
    const buffer = Buffer.alloc(2 ** 20);
    for (let n = fs.readSync(fd, buffer); n > 0; n = fs.readSync(fd, buffer)) hash.update(buffer.subarray(0, n));
  } finally {
    fs.closeSync(fd);
  }
  return `sha256:${hash.digest("hex")}`;
}

/** The manifest of a set: `files` maps each final file name to the path holding its bytes now. */
export function buildManifest(files: Record<string, string>, planId: string = randomUUID()): PlanManifest {
  const hashes: Record<string, string> = {};
  for (const [name, at] of Object.entries(files)) hashes[name] = sha256File(at);
  return { format: MANIFEST_FORMAT, planId, files: hashes };
}

const refuse = (reason: string) => new TailsiftError("plan_mixed", reason);

/** The plan id recorded in a profile.json (null when it has none or is not JSON: readProfile says that). */
function profilePlanId(profilePath: string): string | null {
  try {
    const id = (JSON.parse(fs.readFileSync(profilePath, "utf8")) as { planId?: unknown }).planId;
    return typeof id === "string" ? id : null;
  } catch {
    return null;
  }
}

/**
 * Checks that the plan files beside `profilePath` belong together.
 * @returns the plan id, or null for a folder without a manifest.
 * @throws TailsiftError `plan_mixed` (exit 2) with a one-line reason when they do not.
 */
export function verifyPlanSet(profilePath: string): { planId: string | null } {
  const dir = path.dirname(profilePath);
  const manifestPath = path.join(dir, PLAN_MANIFEST);
  if (!fs.existsSync(manifestPath)) return { planId: null };
  let manifest: PlanManifest;
  try {
    manifest = JSON.parse(fs.readFileSync(manifestPath, "utf8")) as PlanManifest;
    if (manifest.format !== MANIFEST_FORMAT || typeof manifest.planId !== "string" || typeof manifest.files !== "object" || manifest.files === null) throw new Error("format");
  } catch {
    throw refuse(`'${manifestPath}' is not a tailsift plan manifest; the plan folder is damaged — rescan with --out`);
  }
  const rescan = "the plan folder mixes files of different scans (a write cut short, or a file copied in) — rescan with --out";
  if (profilePlanId(profilePath) !== manifest.planId) {
    throw refuse(`'${profilePath}' does not belong to the plan in '${dir}' (its planId is not the manifest's); ${rescan}`);
  }
  const file = path.join(dir, LEVELS);
  const listed = manifest.files[LEVELS];
  const present = fs.existsSync(file);
  if (listed === undefined && present) throw refuse(`'${file}' does not belong to the plan in '${dir}' (its manifest lists no ${LEVELS}); ${rescan}`);
  if (listed !== undefined && !present) throw refuse(`'${file}' is missing from the plan in '${dir}'; ${rescan}`);
  if (listed !== undefined && present && sha256File(file) !== listed) throw refuse(`'${file}' does not belong to the plan in '${dir}' (its content differs from the manifest's); ${rescan}`);
  return { planId: manifest.planId };
}
