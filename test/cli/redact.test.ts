/** --redact: no level value of the input appears in any output; the record says it is redacted. */
import fs from "node:fs";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { runCli } from "../../src/cli.js";
import { redactValue } from "../../src/profile/redact.js";
import { collector, tempDir, writeFile } from "../helpers/tmp.js";

const dir = tempDir("redact");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

describe("scan --redact", () => {
  it("replaces level values by a keyed hash prefix everywhere and skips levels.parquet", async () => {
    const names = ["Alice Example", "Bob Sample", "Carol Invented", "Dan Madeup"];
    const lines = ["owner,species,y"];
    for (let i = 0; i < 400; i++) lines.push(`${names[i % 4]},${i % 3 === 0 ? "Lynxling" : "Otterkin"},${i % 5 === 0 ? 1 : 0}`);
    const file = writeFile(dir, "owners.csv", `${lines.join("\n")}\n`);
    const out = path.join(dir, "out");
    process.env.TAILSIFT_REDACT_KEY = "test-key";
    const c = collector();
    try {
      expect(await runCli(["scan", file, "--target", "y", "--redact", "--out", out, "--format", "json"], c.io)).toBe(0);
    } finally {
      delete process.env.TAILSIFT_REDACT_KEY;
    }
    const outputs = [c.out, ...["profile.json", "decisions.md", "report.html"].map((f) => fs.readFileSync(path.join(out, f), "utf8"))];
    for (const text of outputs) for (const n of [...names, "Lynxling", "Otterkin"]) expect(text).not.toContain(n);
    expect(fs.existsSync(path.join(out, "levels.parquet"))).toBe(false);
    const profile = JSON.parse(c.out);
    expect(profile.input.redacted).toBe(true);
    expect(profile.columns[0].topLevels.map((l: { value: string }) => l.value)).toContain(redactValue("test-key", "Alice Example"));
    // HMAC-SHA-256 as defined in RFC 2104, computed by node:crypto; the tag is its first 12 hex digits
    expect(redactValue("test-key", "Alice Example")).toMatch(/^#[0-9a-f]{12}$/);
  });
});
