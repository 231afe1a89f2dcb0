/** Rendering a drift report: table and Markdown, escaping of data text, no NaN. */
import { describe, expect, it } from "vitest";
import type { ColumnDrift, DriftReport } from "../../src/drift/types.js";
import { DEFAULT_THRESHOLDS } from "../../src/drift/thresholds.js";
import { renderDriftMarkdown, renderDriftTable } from "../../src/render/driftTable.js";

function column(name: string, extra: Partial<ColumnDrift> = {}): ColumnDrift {
  return {
    name, role: "categorical", encoding: "one-hot", present: true, rows: 100, missing: 0, distinct: 3, newLevels: 0,
    unseenRows: 0, unseenShare: 0, unseenInterval: { low: 0, high: 0.037 }, unseenForecast: 0, unseenForecastInterval: { low: 0, high: 0 },
    psi: 0.0123, psiBins: 3, distinctGrowth: 1, status: "ok", reasons: ["PSI 0.012 over 3 bins is below 0.1."], ...extra,
  };
}

const report: DriftReport = {
  tool: { name: "tailsift", version: "0.0.0" },
  createdAt: "2025-01-01T00:00:00.000Z",
  plan: { path: "plan/profile.json", createdAt: "2024-12-01T00:00:00.000Z", paths: ["old.csv"], rows: 1000, fingerprint: "sha256:x", top: 20 },
  input: { paths: ["new.csv"], rows: 100, bytes: 1234, fingerprint: "sha256:y", format: "csv", missingColumns: ["gone"], newColumns: [] },
  thresholds: DEFAULT_THRESHOLDS,
  columns: [
    column("plain"),
    column("pipe|name\nline", { status: "watch", psi: null, distinctGrowth: null, unseenShare: null, reasons: ["level 'a|b' moved"] }),
    { ...column("gone", { present: false, status: "act", reasons: ["Column missing: the new extract has no column 'gone'."] }) },
  ],
  status: "act",
};

describe("renderDriftTable", () => {
  const text = renderDriftTable(report);
  it("has one row per column, the missing one marked, and reasons of non-ok columns only", () => {
    expect(text).toMatch(/│ plain\s+│ ok\s+│ 0\.00 %/);
    expect(text).toMatch(/│ gone\s+│ act\s+│ column missing/);
    expect(text).toContain("gone (act):");
    expect(text).not.toContain("plain (ok):");
    expect(text).toContain("status act (1 act, 1 watch, 1 ok)");
  });
  it("shows n/a for figures that could not be computed, never NaN, and control characters escaped", () => {
    expect(text).toMatch(/│ pipe\|name\\nline\s+│ watch\s+│ n\/a/);
    expect(text).not.toContain("NaN");
    expect(text.split("\n").some((l) => l === "line")).toBe(false);
  });
});

describe("renderDriftMarkdown", () => {
  const md = renderDriftMarkdown(report);
  it("escapes pipes in cells and headings, and lists every column's reasons", () => {
    expect(md).toContain("| pipe\\|name\\nline | watch | n/a |");
    expect(md).toContain("## pipe\\|name\\nline: watch");
    expect(md).toContain("- level 'a\\|b' moved");
    expect(md).toContain("## plain: ok");
    expect(md).toContain("- PSI 0.012 over 3 bins is below 0.1.");
    expect(md.endsWith("\n")).toBe(true);
    expect(md).not.toContain("NaN");
  });
});
