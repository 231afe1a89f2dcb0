/**
 * runState: how a run meets SIGINT / SIGTERM. Outputs are committed in one synchronous
 * step (renames), which no signal handler can interrupt (Node runs handlers between tasks). A
 * signal before the commit aborts it: nothing new is written and the exit is 130 / 143. A signal
 * after it is too late to undo: the run finishes, says so, and exits 0.
 *
 * Test hook (documented in DEVELOPERS.md): TAILSIFT_TEST_PAUSE_AT=<point> makes the run print
 * "tailsift-test: paused at <point>" on stderr and wait there until a signal arrives (at most
 * 60 s), so a test can signal at a known moment. Points: after-pass, before-commit, after-commit.
 */
import { TailsiftError } from "./errors.js";

let received: NodeJS.Signals | null = null;
let committed = false;
let resume: (() => void) | null = null;

export const signalExitCode = (signal: NodeJS.Signals) => (signal === "SIGINT" ? 130 : 143);

/** Records a signal (called by the CLI's handler); wakes a test pause. */
export function noteSignal(signal: NodeJS.Signals): void {
  received ??= signal;
  resume?.();
}

export function signalReceived(): NodeJS.Signals | null { return received; }
export function outputsCommitted(): boolean { return committed; }

/** Throws the interruption when a signal came in; call it before writing anything final. */
export function throwIfSignalled(): void {
  if (received) throw new TailsiftError("interrupted", `interrupted by ${received}; nothing was written`, signalExitCode(received));
}

/** Engine hook: between queries, a signal (before the commit) stops the run at the next query. */
export function throwIfAborted(doing: string): void {
  if (received && !committed) throw new TailsiftError("interrupted", `interrupted by ${received} while ${doing}; nothing was written`, signalExitCode(received));
}

/** Runs the synchronous commit of a run's outputs, unless a signal came first. */
export function commitOutputs(commit: () => void): void {
  throwIfSignalled();
  commit();
  committed = true;
}

/** See the module note: waits at `point` when TAILSIFT_TEST_PAUSE_AT names it. */
export async function testPause(point: string, stderr: (t: string) => void = (t) => process.stderr.write(t)): Promise<void> {
  if (process.env.TAILSIFT_TEST_PAUSE_AT !== point || received) return;
  stderr(`tailsift-test: paused at ${point}\n`);
  await new Promise<void>((done) => {
    const timer = setTimeout(done, 60_000);
    resume = () => { clearTimeout(timer); done(); };
  });
  resume = null;
}
