/** Loads a hand-made fixture profile from test/fixtures (a fresh copy on every call). */
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import type { Profile } from "../../src/profile/types.js";

export function loadFixture(name: "binary" | "no-target"): Profile {
  const path = fileURLToPath(new URL(`../fixtures/profile-${name}.json`, import.meta.url));
  return JSON.parse(readFileSync(path, "utf8")) as Profile;
}

/** How many charts the report should hold for a profile, counted from the profile alone. */
export function expectedChartCount(profile: Profile): number {
  let charts = 0;
  for (const c of profile.columns) {
    if (c.distinct >= 2 && ((c.countOfCounts?.length ?? 0) > 0 || c.coverage.length > 0)) charts += 1;
    if (profile.target && new Set((c.target?.funnel ?? []).map((f) => f.rows)).size >= 2) charts += 1;
    if ((c.hashing?.candidates.length ?? 0) > 0) charts += 1;
    if ((c.evidence?.candidates ?? []).some((e) => Number.isFinite(e.loss))) charts += 1;
  }
  return charts;
}
