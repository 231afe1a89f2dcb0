/**
 * commands/progress: a progress bar on stderr while a long query runs, fed by polling DuckDB's
 * query progress. Shown only when stderr is a terminal and the user did not ask for quiet.
 */
import cliProgress from "cli-progress";
import type { Engine } from "../engine/db.js";

export interface ProgressHandle { attach(engine: Engine | null): void; stop(): void }

export function progressEnabled(opts: { quiet?: boolean; progress?: boolean }, stream: NodeJS.WriteStream = process.stderr): boolean {
  return Boolean(stream.isTTY) && !opts.quiet && opts.progress !== false;
}

/**
 * Polls `engine.progress()` every 200 ms and draws percent, rows per second and time left. The
 * rate is DuckDB's `rows_processed` (rows through every pipeline of the query, so it can exceed
 * the input's rows) over the elapsed time; time left is extrapolated from the percentage.
 */
export function startProgress(label: string, enabled: boolean): ProgressHandle {
  if (!enabled) return { attach() {}, stop() {} };
  const bar = new cliProgress.SingleBar({
    format: `${label} [{bar}] {percentage}% | {rate} engine rows/s | {eta}`,
    stream: process.stderr, hideCursor: true, clearOnComplete: true,
  }, cliProgress.Presets.shades_classic);
  let engine: Engine | null = null;
  let started = false;
  // DuckDB reports progress per query; the long one is the pass, later queries restart from 0.
  // Shown figures only move forward, so the bar tracks the pass and then holds.
  let best = 0;
  let rows = 0;
  let began = 0;
  const timer = setInterval(() => {
    if (!engine) return;
    const p = engine.progress();
    if (!started) { began = Date.now(); bar.start(100, 0, { rate: "-", eta: "" }); started = true; }
    if (!(p.percentage > 0)) return;
    best = Math.max(best, Math.min(100, p.percentage));
    rows = Math.max(rows, p.rowsProcessed);
    const seconds = (Date.now() - began) / 1000;
    const rate = rows > 0 && seconds > 0.5 ? Math.round(rows / seconds).toLocaleString("en-US") : "-";
    const left = best > 1 && best < 100 ? Math.round((seconds * (100 - best)) / best) : null;
    bar.update(Math.round(best), { rate, eta: left === null ? "" : `${left}s left` });
  }, 200);
  timer.unref();
  return {
    attach(e) { engine = e; },
    stop() { clearInterval(timer); if (started) bar.stop(); },
  };
}
