/**
 * profile/schema: the published JSON Schema of profile.json (schema/profile.schema.json) and a
 * validator (ajv). Every profile we write and every plan we read passes through it.
 */
import { createRequire } from "node:module";
import AjvModule from "ajv";
import { TailsiftError } from "../errors.js";
import type { Profile } from "./types.js";

const require = createRequire(import.meta.url);
export const PROFILE_SCHEMA = require("../../schema/profile.schema.json") as Record<string, unknown>;

type AjvCtor = new (opts: Record<string, unknown>) => { compile: (s: unknown) => ((d: unknown) => boolean) & { errors?: { instancePath: string; message?: string }[] | null } };
const Ajv = ((AjvModule as unknown as { default?: AjvCtor }).default ?? AjvModule) as unknown as AjvCtor;
const validate = new Ajv({ allErrors: false, strict: false }).compile(PROFILE_SCHEMA);

/** Returns the profile typed, or throws a TailsiftError naming the first problem. */
export function validateProfile(data: unknown, source = "profile"): Profile {
  if (validate(data)) return data as Profile;
  const first = validate.errors?.[0];
  throw new TailsiftError("bad_profile", `${source} is not a tailsift profile: ${first ? `${first.instancePath || "/"} ${first.message ?? ""}` : "schema mismatch"}`.trim());
}
