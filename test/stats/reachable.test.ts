/**
 * Every module in src/stats/ is reached from the tool's entry points (src/cli.ts, src/index.ts):
 * a statistic the tool prints is computed by the tested module, and a module nothing runs does
 * not stay in stats/ (issue 12, item 5). Walks relative imports (static, re-exports, dynamic).
 * Type-only imports do not count: they run nothing.
 */
import { describe, it, expect } from "vitest";
import { existsSync, readdirSync, readFileSync } from "node:fs";
import { dirname, join, resolve } from "node:path";
import { fileURLToPath } from "node:url";

const SRC = resolve(dirname(fileURLToPath(import.meta.url)), "../../src");
const IMPORT = /(?:^|[\n;])\s*(import|export)(\s+type)?\s[^;]*?from\s+"([^"]+)"|import\(\s*"([^"]+)"\s*\)/g;

/** The files reached from `entries` through relative, non-type imports. */
function reached(entries: readonly string[]): Set<string> {
  const seen = new Set<string>();
  const stack = entries.map((f) => join(SRC, f));
  while (stack.length > 0) {
    const file = stack.pop() as string;
    if (seen.has(file)) continue;
    seen.add(file);
    for (const m of readFileSync(file, "utf8").matchAll(IMPORT)) {
      if (m[2]) continue; // `import type` / `export type`
      const spec = m[3] ?? m[4] ?? "";
      if (!spec.startsWith(".")) continue;
      const target = resolve(dirname(file), spec.replace(/\.js$/, ".ts"));
      if (existsSync(target)) stack.push(target);
    }
  }
  return seen;
}

describe("src/stats reachability", () => {
  it("every statistic module is reached from src/cli.ts or src/index.ts", () => {
    const seen = reached(["cli.ts", "index.ts"]);
    const modules = readdirSync(join(SRC, "stats")).filter((f) => f.endsWith(".ts") && f !== "index.ts" && f !== "types.ts");
    expect(modules.length).toBeGreaterThan(20);
    const unreached = modules.filter((f) => !seen.has(join(SRC, "stats", f)));
    expect(unreached).toEqual([]);
  });

  it("the walk follows imports (a module known to run is reached, a test file is not)", () => {
    const seen = reached(["cli.ts"]);
    expect(seen.has(join(SRC, "stats", "wilsonInterval.ts"))).toBe(true);
    expect(seen.has(join(SRC, "stats", "index.ts"))).toBe(false);
  });
});
