/** profile/readProfile: reads and validates a saved profile.json (scan's report, encode, drift, sql --plan). */
import fs from "node:fs";
import { TailsiftError } from "../errors.js";
import { validateProfile } from "./schema.js";
import type { Profile } from "./types.js";

/** Reads and validates a saved profile.json. */
/** Reads and validates a saved profile.json. */
export function readProfile(file: string): Profile {
  let text: string;
  try {
    text = fs.readFileSync(file, "utf8");
  } catch {
    throw new TailsiftError("input_not_found", `profile '${file}' not found; give the profile.json written by scan --out`);
  }
  let data: unknown;
  try {
    data = JSON.parse(text);
  } catch {
    throw new TailsiftError("bad_profile", `'${file}' is not JSON; give the profile.json written by scan --out`);
  }
  return validateProfile(data, file);
}
