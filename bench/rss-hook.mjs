/**
 * Fallback peak-RSS probe for machines without GNU time (/usr/bin/time). bench/run.mjs preloads it
 * into a measured Node child through NODE_OPTIONS="--import=<this file>" and sets BENCH_RSS_FILE;
 * on exit the child writes its own getrusage figures there: maxRSS (kB, the whole process, so
 * DuckDB's native memory is included) and CPU time of all its threads. Runs after process.exit()
 * too, since Node emits "exit" then.
 */
import fs from "node:fs";

const file = process.env.BENCH_RSS_FILE;
if (file) {
  process.on("exit", () => {
    const usage = process.resourceUsage();
    fs.writeFileSync(file, JSON.stringify({ maxRssKB: usage.maxRSS, cpuMs: Math.round((usage.userCPUTime + usage.systemCPUTime) / 1000) }));
  });
}
