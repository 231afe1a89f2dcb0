/**
 * files/temp: where an output is written before it is renamed into place — a temporary file
 * beside its destination — and the set of temporaries in flight, removed on interrupt
 * (commands/output.removePendingTemps). Below commands/ so that library code (encode) can use it.
 */
import path from "node:path";

/** Temporary files in flight, removed on interrupt. */
export const pendingTemps = new Set<string>();

export function tempPathFor(destination: string): string {
  return path.join(path.dirname(destination), `.${path.basename(destination)}.${process.pid}.tmp`);
}
