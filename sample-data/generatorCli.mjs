/**
 * The command line of the small invented-data generators (growing-visits, visit-outcomes):
 *   node sample-data/NAME.mjs --rows N --seed S --out FILE.csv
 * Checks the arguments (exit 2 with the usage line), then writes the CSV through a temporary file
 * renamed into place, so a failed run leaves no half-written output. Plain Node ESM.
 */
import fs from "node:fs";
import { pathToFileURL } from "node:url";

/**
 * Runs `make(rows, seed).csv` into --out when `moduleUrl` is the script Node was started with.
 * @param {string} moduleUrl the generator's import.meta.url
 * @param {string} name the generator's file name, for the usage line
 * @param {(rows: number, seed: number) => { csv: string }} make
 */
export function runGenerator(moduleUrl, name, make) {
  if (moduleUrl !== pathToFileURL(process.argv[1] ?? "").href) return;
  const args = process.argv.slice(2);
  const value = (flag) => { const i = args.indexOf(flag); return i >= 0 ? args[i + 1] : undefined; };
  const rows = Number(value("--rows")), seed = Number(value("--seed")), out = value("--out");
  if (!Number.isInteger(rows) || rows < 1 || !Number.isInteger(seed) || seed < 0 || !out) {
    process.stderr.write(`usage: node sample-data/${name} --rows N --seed S --out FILE.csv\n`);
    process.exit(2);
  }
  const tmp = `${out}.${process.pid}.tmp`;
  fs.writeFileSync(tmp, make(rows, seed).csv);
  fs.renameSync(tmp, out);
}
