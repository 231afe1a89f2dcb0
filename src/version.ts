/** The tool's version, read from package.json (every command records it). */
import { createRequire } from "node:module";

export function toolVersion(): string {
  const require = createRequire(import.meta.url);
  return (require("../package.json") as { version: string }).version;
}
