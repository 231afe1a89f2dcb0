import type { Engine } from "../engine/db.js";

/** Where a command prints; tests pass collectors, the binary passes process streams. */
export interface CliIO {
  stdout: (text: string) => void;
  stderr: (text: string) => void;
  /** Receives the running engine so a signal can interrupt it (null when none runs). */
  onEngine?: (engine: Engine | null) => void;
}
