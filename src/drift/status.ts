/**
 * drift/status: combining the checks of one column into its status. The status is the worst of
 * its checks (ok < watch < act). A column the plan drops (encoding `drop`: identifiers, constants)
 * is capped at `watch`: its drift cannot reach the model's features, but a change there (a
 * constant column that now varies, an identifier that disappears) is still worth a look.
 */
import type { Encoding } from "../profile/types.js";
import type { DriftStatus, Verdict } from "./types.js";

const RANK: Record<DriftStatus, number> = { ok: 0, watch: 1, act: 2 };

/** The more severe of two statuses. */
export function worse(a: DriftStatus, b: DriftStatus): DriftStatus {
  return RANK[b] > RANK[a] ? b : a;
}

/** The most severe status of a list; an empty list is `ok`. */
export function worst(statuses: readonly DriftStatus[]): DriftStatus {
  return statuses.reduce<DriftStatus>(worse, "ok");
}

/**
 * A column's status and reasons from its checks' verdicts: the reasons of the checks that are not
 * ok, or, when all are ok, the ok sentences (so every column says what was measured).
 * `encoding` is the plan's encoding; `drop` caps the status at watch, with a sentence saying so.
 */
export function columnStatus(verdicts: readonly Verdict[], encoding: Encoding): { status: DriftStatus; reasons: string[] } {
  const raised = verdicts.filter((v) => v.status !== "ok");
  const status = worst(raised.map((v) => v.status));
  const reasons = (raised.length > 0 ? raised : verdicts).map((v) => v.reason);
  if (status === "act" && encoding === "drop") {
    return { status: "watch", reasons: [...reasons, "The plan drops this column, so its drift does not reach the model's features: status capped at watch."] };
  }
  return { status, reasons };
}
