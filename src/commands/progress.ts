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

/** Polls `engine.progress()` every 200 ms and draws percent, rows per second and time left. */
export function startProgress(label: string, enabled: boolean): ProgressHandle {
  if (!enabled) return { attach() {}, stop() {} };
  const bar = new cliProgress.SingleBar({
    format: `${label} [{bar}] {percentage}% | {rate} rows/s | eta {eta_formatted}`,
    stream: process.stderr, hideCursor: true, clearOnComplete: true, etaBuffer: 20,
  }, cliProgress.Presets.shades_classic);
  let engine: Engine | null = null;
  let started = false;
  const began = Date.now();
  const timer = setInterval(() => {
    if (!engine) return;
    const p = engine.progress();
    if (p.percentage < 0) return;
    if (!started) { bar.start(100, 0, { rate: "-" }); started = true; }
    const seconds = (Date.now() - began) / 1000;
    const rate = p.rowsProcessed > 0 && seconds > 0 ? Math.round(p.rowsProcessed / seconds).toLocaleString("en-US") : "-";
    bar.update(Math.min(100, Math.round(p.percentage)), { rate });
  }, 200);
  timer.unref();
  return {
    attach(e) { engine = e; },
    stop() { clearInterval(timer); if (started) bar.stop(); },
  };
}
