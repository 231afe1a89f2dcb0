/**
 * profile/redact: replaces every level value in a profile by a keyed hash prefix, for extracts
 * that hold personal data. Value → "#" + the first 12 hex digits of HMAC-SHA-256(key, value).
 * With the same key the same value always gets the same tag, so a reviewer can still follow a
 * level through the record; without the key the tag cannot be reversed by guessing common values.
 * A redacted profile is for review: `encode` cannot map tags back to levels and refuses it.
 */
import { createHmac, randomBytes } from "node:crypto";
import type { ColumnProfile, Profile } from "./types.js";

export function redactValue(key: string, value: string): string {
  return `#${createHmac("sha256", key).update(value, "utf8").digest("hex").slice(0, 12)}`;
}

/** The parameters with every level value (kept, one-hot, indicator levels) tagged; the shape is kept. */
function redactParams<P extends object>(params: P, tag: (v: string) => string): P {
  const tagged = (v: unknown) => (typeof v === "string" ? tag(v) : v);
  const entries = Object.entries(params).map(([k, v]) => [k,
    (k === "keep" || k === "levels") && Array.isArray(v) ? v.map(tagged) : k === "one" || k === "zero" ? tagged(v) : v]);
  return { ...params, ...Object.fromEntries(entries) };
}

/** A recommendation or candidate with its parameters' level values tagged. */
function withRedactedParams<R extends { params: object }>(r: R, tag: (v: string) => string): R {
  return { ...r, params: redactParams(r.params, tag) };
}

function redactColumn(c: ColumnProfile, tag: (v: string) => string): ColumnProfile {
  const t = (v: string | null) => (v === null ? null : tag(v));
  const out: ColumnProfile = {
    ...c,
    topLevels: c.topLevels.map((l) => ({ ...l, value: t(l.value) })),
    recommendation: { ...withRedactedParams(c.recommendation, tag), reasons: c.recommendation.reasons.map((r) => redactQuoted(r, tag)) },
  };
  if (c.variants) out.variants = { ...c.variants, examples: c.variants.examples.map((g) => g.map(tag)) };
  if (c.placeholders) out.placeholders = { ...c.placeholders, top: c.placeholders.top.map((l) => ({ ...l, value: tag(l.value) })) };
  if (c.target?.funnel) out.target = { ...c.target, funnel: c.target.funnel.map((f) => ({ ...f, value: t(f.value) })) };
  if (c.evidence) {
    out.evidence = {
      ...c.evidence,
      reason: redactQuoted(c.evidence.reason, tag),
      candidates: c.evidence.candidates.map((x) => withRedactedParams(x, tag)),
    };
  }
  return out;
}

/** Level values quoted in reasons ('value') are replaced too. */
function redactQuoted(text: string, tag: (v: string) => string): string {
  return text.replace(/'([^']*)'/g, (_m, v: string) => `'${tag(v)}'`);
}

/**
 * Returns a redacted copy. `key` defaults to a random key that is not kept, so tags cannot be
 * linked across runs; pass a key (e.g. from TAILSIFT_REDACT_KEY) to keep them stable.
 */
export function redactProfile(profile: Profile, key?: string): Profile {
  const secret = key ?? randomBytes(32).toString("hex");
  const names = new Set(profile.columns.map((c) => c.name));
  // column names are not personal data; keep them readable in reasons
  const tag = (v: string) => (names.has(v) ? v : redactValue(secret, v));
  return {
    ...profile,
    input: { ...profile.input, redacted: true },
    settings: { ...profile.settings, redaction: key ? "HMAC-SHA-256 with the key in TAILSIFT_REDACT_KEY, first 12 hex digits" : "HMAC-SHA-256 with a random key that was not kept, first 12 hex digits" },
    columns: profile.columns.map((c) => redactColumn(c, tag)),
  };
}
