/**
 * The report's charts: vega-lite specs built from a column's profile, compiled by vega-lite and
 * rendered headless to SVG by vega. Data is always inlined (`values`); the loader refuses every
 * fetch, so rendering never touches the network or the file system.
 */
import { compile, type TopLevelSpec } from "vega-lite";
import { View, parse, loader as vegaLoader, type Loader } from "vega";
import type { ColumnProfile, ProfileTarget } from "../profile/types.js";
import { TailsiftError } from "../errors.js";
import { showControlCharacters } from "./escape.js";
import { formatCompact, formatCount, formatShare } from "./format.js";
import { label } from "../evidence/oneSe.js";
import { Z_95, Z_998, coveragePoints, evidencePoints, funnelHalfWidth, funnelLimitPoints, wrapLabel } from "./chart-data.js";

export { funnelLimitPoints } from "./chart-data.js";

/** A vega-lite spec as a plain object (inline data only). */
export type ChartSpec = Record<string, unknown>;

const WIDTH = 270;
const HEIGHT = 180;
const MAX_LABELS = 6;
const LABEL_LENGTH = 24;
const [INSIDE, OUTSIDE_95, OUTSIDE_998] = ["inside", "outside 95 %", "outside 99.8 %"];

const BASE = {
  width: WIDTH,
  height: HEIGHT,
  config: {
    font: "system-ui, sans-serif",
    title: { anchor: "start", fontSize: 13 },
    axis: { labelFontSize: 10, titleFontSize: 11, titleFontWeight: "normal", gridColor: "#eee" },
    view: { stroke: "#ccc" },
    legend: { orient: "bottom", labelFontSize: 10, titleFontSize: 10 },
  },
};

/**
 * Tick values for a log axis from `min` to `max`: every integer when the range is short, else
 * 1-2-5 steps (1, 2, 5, 10, 20, …) inside the range, thinned to powers of ten past eight ticks;
 * the ends are added when fewer than two ticks fall inside.
 */
function logTicks(min: number, max: number): number[] {
  const lo = Math.max(1, Math.ceil(min));
  const hi = Math.floor(max);
  if (hi - lo <= 11) return Array.from({ length: Math.max(0, hi - lo + 1) }, (_, i) => lo + i);
  const steps: number[] = [];
  for (let p = 10 ** Math.floor(Math.log10(lo)); p <= hi; p *= 10) {
    for (const m of [1, 2, 5]) if (m * p >= lo && m * p <= hi) steps.push(m * p);
  }
  const ticks = steps.length > 8 ? steps.filter((t) => Number.isInteger(Math.log10(t))) : steps;
  return ticks.length >= 2 ? ticks : [...new Set([lo, ...ticks, hi])];
}

/** How a level value is shown on a chart: null → "(missing)", controls as symbols, at most 24 characters. */
function chartLabel(value: string | null): string {
  if (value === null) return "(missing)";
  const shown = showControlCharacters(value);
  return shown.length > LABEL_LENGTH ? `${shown.slice(0, LABEL_LENGTH - 1)}…` : shown;
}

/**
 * Coverage curve: share of non-missing rows covered by the top-ranked levels (log x), with the
 * coverage target (default 95 %) and the one-hot width as reference lines when given.
 * No coverage data → null.
 */
export function coverageChartSpec(
  column: ColumnProfile,
  reference: { coverage?: number; maxOneHot?: number } = {},
): ChartSpec | null {
  const points = coveragePoints(column);
  if (points.length === 0) return null;
  const maxRank = Math.max(2, ...points.map((p) => p.rank));
  const x = { field: "rank", type: "quantitative", title: "levels, most frequent first (log scale)",
    scale: { type: "log", domain: [1, maxRank], nice: false },
    axis: { values: logTicks(1, maxRank), format: ",d" } };
  const layers: ChartSpec[] = [{
    data: { values: points },
    mark: { type: "line", color: "#3a6ea5", point: points.length <= 12, interpolate: "linear" },
    encoding: { x, y: { field: "share", type: "quantitative", title: "rows covered",
      scale: { domain: [0, 1] }, axis: { format: ".0%" } } },
  }];
  if (reference.coverage !== undefined) {
    layers.push({ data: { values: [{ share: reference.coverage }] },
      mark: { type: "rule", color: "#999", strokeDash: [4, 3] },
      encoding: { y: { field: "share", type: "quantitative" } } });
  }
  if (reference.maxOneHot !== undefined && reference.maxOneHot <= maxRank) {
    layers.push({ data: { values: [{ rank: reference.maxOneHot }] },
      mark: { type: "rule", color: "#c0392b", strokeDash: [2, 2] },
      encoding: { x: { field: "rank", type: "quantitative" } } });
  }
  return { ...BASE, description: "Coverage curve", layer: layers, title: "Coverage of rows by levels" };
}

/** The levels to label: largest |z| first, ties by label, at most MAX_LABELS. */
function mostExtreme<T extends { zScore: number; level: string }>(points: T[]): T[] {
  const byLabel = (a: T, b: T): number => (a.level < b.level ? -1 : a.level > b.level ? 1 : 0);
  return [...points].sort((a, b) => b.zScore - a.zScore || byLabel(a, b)).slice(0, MAX_LABELS);
}

/**
 * Funnel plot: each level's target rate (or mean) against its rows (log x), with 95 % and
 * 99.8 % control limits around the overall mean (Spiegelhalter 2005). Binary targets use the
 * binomial spread; continuous targets use `target.sd`, and have no limits without it. The most
 * extreme levels outside the limits are labelled. No funnel data, or levels all of one size
 * (e.g. an identifier: every level one row, nothing to compare) → null.
 */
export function funnelChartSpec(column: ColumnProfile, target: ProfileTarget): ChartSpec | null {
  const funnel = (column.target?.funnel ?? []).filter((f) => f.rows >= 1 && Number.isFinite(f.rate));
  if (new Set(funnel.map((f) => f.rows)).size < 2) return null;
  const p0 = target.mean;
  const sd = target.kind === "continuous" ? target.sd : undefined;
  const hasLimits = target.kind === "binary" || sd !== undefined;
  const points = funnel.map((f) => {
    const half95 = hasLimits ? funnelHalfWidth(p0, f.rows, Z_95, sd) : null;
    const half998 = hasLimits ? funnelHalfWidth(p0, f.rows, Z_998, sd) : null;
    const distance = Math.abs(f.rate - p0);
    const band = half998 !== null && distance > half998 ? OUTSIDE_998
      : half95 !== null && distance > half95 ? OUTSIDE_95 : INSIDE;
    const value = f.value === null ? "(missing)" : showControlCharacters(f.value);
    const rateText = target.kind === "binary" ? formatShare(f.rate) : formatCompact(f.rate);
    return { level: chartLabel(f.value), description: `${value}: ${formatCount(f.rows)} rows, ${rateText} (${band})`,
      rows: f.rows, rate: f.rate, band, zScore: half95 ? (distance / half95) * Z_95 : 0 };
  });
  const nMin = Math.min(...points.map((p) => p.rows));
  const nMax = Math.max(...points.map((p) => p.rows), nMin + 1);
  const [xMin, xMax] = [Math.max(1, nMin / 1.2), nMax * 1.2];
  const x = { field: "rows", type: "quantitative", title: "rows in level (log scale)",
    scale: { type: "log", domain: [xMin, xMax], nice: false }, axis: { values: logTicks(xMin, xMax), format: ",d" } };
  const rate = { scale: { zero: false }, ...(target.kind === "binary" ? { axis: { format: ".0%" } } : {}) };
  const yTitle = target.kind === "binary" ? "target rate" : "target mean";
  const layers: ChartSpec[] = [];
  if (hasLimits) {
    const limits = [["95 %", Z_95], ["99.8 %", Z_998]].flatMap(([name, z]) =>
      funnelLimitPoints(p0, nMin, nMax, z as number, sd).flatMap((l) => [
        { n: l.n, bound: l.low, limit: name, side: "low" },
        { n: l.n, bound: l.high, limit: name, side: "high" },
      ]));
    layers.push({ data: { values: limits }, mark: { type: "line", color: "#888", strokeWidth: 1 },
      encoding: { x: { ...x, field: "n" }, y: { field: "bound", type: "quantitative", title: yTitle, ...rate },
        strokeDash: { field: "limit", type: "nominal", legend: null,
          scale: { domain: ["95 %", "99.8 %"], range: [[4, 3], [1, 0]] } },
        detail: { field: "side", type: "nominal" } } });
  }
  layers.push(
    { data: { values: [{ mean: p0 }] }, mark: { type: "rule", color: "#222", strokeWidth: 1.5 },
      encoding: { y: { field: "mean", type: "quantitative" } } },
    // Points carry no per-point ARIA text (up to a few hundred levels; the tables list them); the
    // labelled levels below do.
    { data: { values: points }, mark: { type: "point", filled: true, size: 28, opacity: 0.8, aria: false },
      encoding: { x, y: { field: "rate", type: "quantitative", title: yTitle, ...rate },
        color: { field: "band", type: "nominal", title: null,
          scale: { domain: [INSIDE, OUTSIDE_95, OUTSIDE_998], range: ["#8aa9c9", "#e0a030", "#c0392b"] } } } },
    { data: { values: mostExtreme(points.filter((p) => p.band !== INSIDE)) },
      mark: { type: "text", align: "left", dx: 5, dy: -4, fontSize: 9, color: "#333" },
      encoding: { x, y: { field: "rate", type: "quantitative" }, text: { field: "level", type: "nominal" },
        description: { field: "description", type: "nominal" } } },
  );
  return { ...BASE, description: "Funnel plot", layer: layers,
    title: `Level ${target.kind === "binary" ? "rates" : "means"} against size` };
}

/**
 * Collision curve: share of rows whose hashed bucket is shared with another level, against the
 * hash width (log2 x), with the collision budget as a line and the chosen width marked.
 * No hashing figures → null.
 */
export function collisionChartSpec(column: ColumnProfile, budget: number): ChartSpec | null {
  const hashing = column.hashing;
  const candidates = (hashing?.candidates ?? []).filter((c) => c.width >= 1 && Number.isFinite(c.collisionRowShare));
  if (hashing === undefined || candidates.length === 0) return null;
  const values = [...candidates].sort((a, b) => a.width - b.width)
    .map((c) => ({ width: c.width, share: c.collisionRowShare, chosen: c.width === hashing.width ? "chosen width" : "candidate" }));
  const x = { field: "width", type: "quantitative", title: "buckets (log2 scale)", scale: { type: "log", base: 2 },
    axis: { values: values.map((v) => v.width), format: ",d", labelAngle: values.length > 6 ? -40 : 0 } };
  return { ...BASE, description: "Collision curve", title: "Hash collisions against width",
    layer: [
      { data: { values }, mark: { type: "line", color: "#3a6ea5", point: true },
        encoding: { x, y: { field: "share", type: "quantitative", title: "colliding rows", axis: { format: ".1%" } } } },
      { data: { values: values.filter((v) => v.chosen === "chosen width") },
        mark: { type: "point", shape: "diamond", size: 120, filled: true, color: "#c0392b" },
        encoding: { x, y: { field: "share", type: "quantitative" } } },
      { data: { values: [{ budget }] }, mark: { type: "rule", color: "#c0392b", strokeDash: [4, 3] },
        encoding: { y: { field: "budget", type: "quantitative" } } },
    ] };
}

/**
 * A y-axis whose labels wrap onto lines of at most EVIDENCE_LABEL_WIDTH characters (vega draws an
 * array as lines, the first at the tick), each wrapped label moved up by half its extra lines so
 * it stays centred on its tick. The labels are the tool's own words, quoted as JSON literals.
 */
function wrappedLabelAxis(labels: readonly string[]): Record<string, unknown> {
  let labelExpr = "datum.label";
  const shifts: string[] = [];
  for (const text of labels) {
    const lines = wrapLabel(text, EVIDENCE_LABEL_WIDTH);
    if (lines.length < 2) continue;
    labelExpr = `datum.label === ${JSON.stringify(text)} ? ${JSON.stringify(lines)} : ${labelExpr}`;
    shifts.push(`datum.label === ${JSON.stringify(text)} ? ${(-(lines.length - 1) * EVIDENCE_LINE_HEIGHT) / 2}`);
  }
  return { labelExpr, labelLineHeight: EVIDENCE_LINE_HEIGHT, labelLimit: EVIDENCE_LABEL_WIDTH * 8 + 8,
    labelOffset: { expr: [...shifts, "0"].join(" : ") } };
}

const EVIDENCE_LABEL_WIDTH = 22;
const EVIDENCE_LINE_HEIGHT = 11;
const EVIDENCE_ROLES: readonly (readonly [string, string])[] = [
  ["candidate", "#8aa9c9"], ["best (lowest loss)", "#24476b"], ["chosen", "#c0392b"], ["best and chosen", "#c0392b"],
];

/**
 * Evidence chart: each candidate's out-of-fold loss as a point with a ±1 standard-error bar
 * (horizontal; candidates top to bottom, simplest first), the one-standard-error threshold as a
 * dashed line, the chosen candidate in red and the best in dark blue. The candidate names are
 * the tool's own words (evidence/oneSe `label`), never data. No evidence, or no candidate with a
 * finite loss → null.
 */
export function evidenceChartSpec(column: ColumnProfile): ChartSpec | null {
  const e = column.evidence;
  const points = e ? evidencePoints(e) : [];
  if (e === undefined || points.length === 0) return null;
  const roleOf = (c: string): string => (c === e.chosen ? (c === e.best ? "best and chosen" : "chosen") : c === e.best ? "best (lowest loss)" : "candidate");
  const values = points.map((p) => ({ candidate: label(p.candidate), loss: p.loss, low: p.low, high: p.high, role: roleOf(p.candidate) }));
  const roles = EVIDENCE_ROLES.filter(([role]) => values.some((v) => v.role === role));
  const labels = values.map((v) => v.candidate);
  const y = { field: "candidate", type: "nominal", title: null, sort: labels, axis: wrappedLabelAxis(labels) };
  const x = { type: "quantitative", title: e.metric === "log-loss" ? "out-of-fold log loss (nats per row)" : "out-of-fold squared error per row",
    scale: { zero: false, padding: 10 }, axis: { tickCount: 5 } };
  return { ...BASE, height: Math.max(60, 30 * values.length), description: "Out-of-fold loss of each candidate encoding",
    title: "Candidates' out-of-fold loss, ±1 standard error",
    layer: [
      { data: { values: values.filter((v) => v.low !== null && v.high !== null) },
        mark: { type: "errorbar", ticks: { size: 8 }, color: "#555" },
        encoding: { y, x: { ...x, field: "low" }, x2: { field: "high" } } },
      { data: { values: [{ threshold: e.threshold }] }, mark: { type: "rule", color: "#c0392b", strokeDash: [4, 3] },
        encoding: { x: { ...x, field: "threshold" } } },
      { data: { values }, mark: { type: "point", filled: true, size: 80, opacity: 1 },
        encoding: { y, x: { ...x, field: "loss" },
          color: { field: "role", type: "nominal", title: null,
            scale: { domain: roles.map(([r]) => r), range: roles.map(([, c]) => c) } } } },
    ] };
}

/** A vega loader that refuses every load (and notes it): charts use inline data only. */
function offlineLoader(refused: string[]): Loader {
  const refuse = (what: string): Promise<never> => {
    refused.push(what);
    return Promise.reject(new TailsiftError("render-offline", `chart tried to load '${what}'; charts use inline data only`));
  };
  return Object.assign(vegaLoader(), {
    load: (uri: string) => refuse(uri),
    sanitize: (uri: string) => refuse(uri),
    http: (uri: string) => refuse(uri),
    file: (name: string) => refuse(name),
  });
}

/** A logger for vega-lite and vega that prints nothing and keeps the errors. */
function quietLogger(errors: string[]) {
  const logger = {
    level: (): number => 0,
    error: (...args: unknown[]) => { errors.push(args.map(String).join(" ")); return logger; },
    warn: () => logger,
    info: () => logger,
    debug: () => logger,
  };
  return logger;
}

/**
 * Compiles a vega-lite spec and renders it headless to an SVG string (vega's SVG string
 * renderer; text is SVG text, values in it are XML-escaped by vega). Throws a TailsiftError when
 * compiling or rendering reports an error, or when the SVG would contain script or links.
 */
export async function chartSvg(spec: object): Promise<string> {
  const errors: string[] = [];
  const refused: string[] = [];
  const logger = quietLogger(errors);
  const compiled = compile(spec as TopLevelSpec, { logger }).spec;
  const view = new View(parse(compiled), { renderer: "none", loader: offlineLoader(refused), logger, logLevel: 0 });
  try {
    const svg = await view.toSVG();
    if (refused.length > 0) {
      throw new TailsiftError("render-offline", `chart tried to load '${refused.join("', '")}'; charts use inline data only`);
    }
    if (errors.length > 0) throw new TailsiftError("render-chart", `chart rendering failed: ${errors.join("; ")}`);
    if (/<script|<foreignObject|javascript:|\shref=/i.test(svg)) {
      throw new TailsiftError("render-chart", "chart SVG contains script or links; refusing to embed it");
    }
    return svg;
  } finally {
    view.finalize();
  }
}
