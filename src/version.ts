/** version: the tool's version, read from package.json (one level above src/ and dist/). */
import { createRequire } from "node:module";

export function toolVersion(): string {
  const require = createRequire(import.meta.url);
  return (require("../package.json") as { version: string }).version;
}
