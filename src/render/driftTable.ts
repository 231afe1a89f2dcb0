/**
 * render/driftTable: a drift report for people — a terminal table (cli-table3, no colour) with
 * the reasons of every column that is not ok below it, and a Markdown record with every column's
 * reasons. Text from the data (column names, level values inside reasons) is escaped: control
 * characters are made visible in the terminal, Markdown syntax is escaped in the record.
 */
import Table from "cli-table3";
import type { ColumnDrift, DriftReport } from "../profile/driftTypes.js";
import { escapeMarkdownCell, escapeMarkdownText, showControlCharacters } from "./escape.js";
import { formatCompact, formatCount, formatNumber, formatShare } from "./format.js";

const HEAD = ["column", "status", "unseen", "forecast (95 %)", "PSI", "distinct ×", "target levels apart"];

function cells(c: ColumnDrift): string[] {
  if (!c.present) return [c.name, c.status, "column missing", "", "", "", ""];
  const f = c.unseenForecastInterval;
  return [
    c.name, c.status,
    formatShare(c.unseenShare, 2),
    `${formatShare(c.unseenForecast, 2)}${f ? ` (${formatShare(f.low, 2)}–${formatShare(f.high, 2)})` : ""}`,
    formatNumber(c.psi, 3),
    formatCompact(c.distinctGrowth, 3),
    c.targetShift ? `${c.targetShift.separated} of ${c.targetShift.tested}` : "",
  ];
}

function summary(r: DriftReport): string[] {
  const counts = (["act", "watch", "ok"] as const).map((s) => `${r.columns.filter((c) => c.status === s).length} ${s}`).join(", ");
  const lines = [
    `drift: ${formatCount(r.input.rows)} rows against the plan of ${formatCount(r.plan.rows)} rows (${r.plan.path}); status ${r.status} (${counts})`,
  ];
  if (r.target) lines.push(`target: ${r.target.reasons.join(" ")}`);
  else if (r.classes) lines.push(`target (${r.classes.status}): ${r.classes.reasons.join(" ")}`);
  else if (r.plan.target) lines.push(`target: '${r.plan.target.column}' is not in the new extract; target shift not checked.`);
  if (r.target && r.target.bad > 0) lines.push(`target: ${formatCount(r.target.bad)} values fit neither target class and were left out.`);
  if (r.input.newColumns.length > 0) lines.push(`new columns not in the plan: ${r.input.newColumns.join(", ")}`);
  return lines.map(showControlCharacters);
}

/** The terminal view: summary lines, one table row per column, then the reasons of non-ok columns. */
export function renderDriftTable(r: DriftReport): string {
  const table = new Table({ head: HEAD, style: { head: [], border: [], compact: true } });
  for (const c of r.columns) table.push(cells(c).map(showControlCharacters));
  const raised = r.columns.filter((c) => c.status !== "ok");
  const reasons = raised.flatMap((c) => [`${c.name} (${c.status}):`, ...c.reasons.map((x) => `  - ${x}`)]).map(showControlCharacters);
  return `${[...summary(r), table.toString(), ...reasons].join("\n")}\n`;
}

function mdRow(values: readonly string[]): string {
  return `| ${values.map(escapeMarkdownCell).join(" | ")} |`;
}

/** The Markdown record: summary, thresholds, the table, and every column's reasons. */
export function renderDriftMarkdown(r: DriftReport): string {
  const t = r.thresholds;
  const out = [
    "# Drift check", "",
    ...summary(r).map((l) => `- ${escapeMarkdownText(l)}`),
    `- ${escapeMarkdownText(`thresholds: PSI watch ${formatCompact(t.psiWatch)}, act ${formatCompact(t.psiAct)} (rule of thumb); unseen act at ${formatCompact(t.unseenActRatio)}× the forecast and above ${formatShare(t.unseenActMin)}; target act at effect size ${formatCompact(t.effectAct)}`)}`,
    "", mdRow(HEAD), `| ${HEAD.map(() => "---").join(" | ")} |`,
    ...r.columns.map((c) => mdRow(cells(c))), "",
  ];
  for (const c of r.columns) {
    out.push(`## ${escapeMarkdownText(c.name)}: ${c.status}`, "", ...c.reasons.map((x) => `- ${escapeMarkdownText(x)}`), "");
  }
  return `${out.join("\n")}`;
}
