/**
 * The report's charts: vega-lite specs built from a column's profile, compiled by vega-lite and
 * rendered headless to SVG by vega. Data is always inlined (`values`); the loader refuses every
 * fetch, so rendering never touches the network or the file system.
 */
import { compile, type TopLevelSpec } from "vega-lite";
import { View, parse, loader as vegaLoader, type Loader } from "vega";
import type { ColumnProfile, ProfileTarget } from "../profile/types.js";
import { TailsiftError } from "../errors.js";
import { Z_95, Z_998, coveragePoints, funnelHalfWidth, funnelLimitPoints } from "./chart-data.js";

export { funnelLimitPoints } from "./chart-data.js";

/** A vega-lite spec as a plain object (inline data only). */
export type ChartSpec = Record<string, unknown>;

const WIDTH = 300;
const HEIGHT = 190;
const MAX_LABELS = 8;
const LABEL_LENGTH = 24;

const BASE = {
  width: WIDTH,
  height: HEIGHT,
  config: {
    font: "system-ui, sans-serif",
    title: { anchor: "start", fontSize: 13, subtitleFontSize: 11, subtitleColor: "#555" },
    axis: { labelFontSize: 10, titleFontSize: 11, titleFontWeight: "normal", gridColor: "#eee" },
    view: { stroke: "#ccc" },
    legend: { orient: "bottom", labelFontSize: 10, titleFontSize: 10 },
  },
};

/** How a level value is shown on a chart: null → "(missing)", shortened to 24 characters. */
function chartLabel(value: string | null): string {
  if (value === null) return "(missing)";
  return value.length > LABEL_LENGTH ? `${value.slice(0, LABEL_LENGTH - 1)}…` : value;
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
    scale: { type: "log", domain: [1, maxRank] } };
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
  const source = column.countOfCounts?.length ? "from the count-of-counts" : "from the coverage figures only";
  return { ...BASE, description: "Coverage curve", layer: layers,
    title: { text: "Coverage of rows by levels", subtitle: `share of non-missing rows, ${source}` } };
}

/**
 * Funnel plot: each level's target rate (or mean) against its rows (log x), with 95 % and
 * 99.8 % control limits around the overall mean (Spiegelhalter 2005). Binary targets use the
 * binomial spread; continuous targets use `target.sd`, and have no limits without it. The most
 * extreme levels outside the limits are labelled. No funnel data → null.
 */
export function funnelChartSpec(column: ColumnProfile, target: ProfileTarget): ChartSpec | null {
  const funnel = (column.target?.funnel ?? []).filter((f) => f.rows >= 1 && Number.isFinite(f.rate));
  if (funnel.length === 0) return null;
  const p0 = target.mean;
  const sd = target.kind === "continuous" ? target.sd : undefined;
  const hasLimits = target.kind === "binary" || sd !== undefined;
  const points = funnel.map((f) => {
    const half95 = hasLimits ? funnelHalfWidth(p0, f.rows, Z_95, sd) : null;
    const half998 = hasLimits ? funnelHalfWidth(p0, f.rows, Z_998, sd) : null;
    const distance = Math.abs(f.rate - p0);
    const band = half998 !== null && distance > half998 ? "outside 99.8 %"
      : half95 !== null && distance > half95 ? "outside 95 %" : "inside 95 %";
    return { level: chartLabel(f.value), rows: f.rows, rate: f.rate, band, z: half95 ? (distance / half95) * Z_95 : 0 };
  });
  const nMin = Math.min(...points.map((p) => p.rows));
  const nMax = Math.max(...points.map((p) => p.rows), nMin + 1);
  const x = { field: "rows", type: "quantitative", title: "rows in level (log scale)", scale: { type: "log" } };
  const rate = target.kind === "binary" ? { axis: { format: ".0%" } } : {};
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
        strokeDash: { field: "limit", type: "nominal", title: "control limit",
          scale: { domain: ["95 %", "99.8 %"], range: [[4, 3], [1, 0]] } },
        detail: { field: "side", type: "nominal" } } });
  }
  layers.push(
    { data: { values: [{ mean: p0 }] }, mark: { type: "rule", color: "#444" },
      encoding: { y: { field: "mean", type: "quantitative" } } },
    { data: { values: points }, mark: { type: "point", filled: true, size: 28, opacity: 0.8 },
      encoding: { x, y: { field: "rate", type: "quantitative", title: yTitle, ...rate },
        color: { field: "band", type: "nominal", title: "level",
          scale: { domain: ["inside 95 %", "outside 95 %", "outside 99.8 %"], range: ["#8aa9c9", "#e0a030", "#c0392b"] } },
        tooltip: [{ field: "level", type: "nominal" }, { field: "rows", type: "quantitative" },
          { field: "rate", type: "quantitative", format: ".3f" }] } },
    { data: { values: points.filter((p) => p.band !== "inside 95 %").sort((a, b) => b.z - a.z || a.level.localeCompare(b.level)).slice(0, MAX_LABELS) },
      mark: { type: "text", align: "left", dx: 5, dy: -4, fontSize: 9, color: "#333" },
      encoding: { x, y: { field: "rate", type: "quantitative" }, text: { field: "level", type: "nominal" } } },
  );
  const what = hasLimits ? "95 % and 99.8 % limits around the overall mean" : "no limits: the target's spread is not in the profile";
  return { ...BASE, description: "Funnel plot", layer: layers,
    title: { text: `Level ${target.kind === "binary" ? "rates" : "means"} against size`, subtitle: what } };
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
  const x = { field: "width", type: "quantitative", title: "buckets (log2 scale)", scale: { type: "log", base: 2 } };
  return { ...BASE, description: "Collision curve",
    title: { text: "Hash collisions against width", subtitle: "share of rows in a bucket shared with another level" },
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

/** A vega loader that refuses every load: charts use inline data only. */
function offlineLoader(): Loader {
  const refuse = (what: string): Promise<never> =>
    Promise.reject(new TailsiftError("render-offline", `chart tried to load '${what}'; charts use inline data only`));
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
  const logger = quietLogger(errors);
  const compiled = compile(spec as TopLevelSpec, { logger }).spec;
  const view = new View(parse(compiled), { renderer: "none", loader: offlineLoader(), logger, logLevel: 0 });
  try {
    const svg = await view.toSVG();
    if (errors.length > 0) throw new TailsiftError("render-chart", `chart rendering failed: ${errors.join("; ")}`);
    if (/<script|<foreignObject|javascript:|\shref=/i.test(svg)) {
      throw new TailsiftError("render-chart", "chart SVG contains script or links; refusing to embed it");
    }
    return svg;
  } finally {
    view.finalize();
  }
}
