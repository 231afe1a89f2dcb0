#!/usr/bin/env node
/**
 * Stand-in for `node dist/cli.js encode …` while src/cli.ts does not register the encode command
 * yet: the built addEncodeCommand on a fresh program, with the same signal handling as cli.ts
 * (interrupt the running engine, remove pending temporaries, exit 130/143). Needs `npx tsc`.
 */
import { Command } from "commander";
import { addEncodeCommand } from "../../dist/commands/encodeCli.js";
import { removePendingTemps } from "../../dist/commands/output.js";

let engine = null;
let signalled = null;
const onSignal = (signal) => {
  if (signalled) process.exit(signal === "SIGINT" ? 130 : 143);
  signalled = signal;
  if (engine) engine.interrupt();
  else { removePendingTemps(); process.exit(signal === "SIGINT" ? 130 : 143); }
};
process.on("SIGINT", onSignal);
process.on("SIGTERM", onSignal);
const io = { stdout: (t) => process.stdout.write(t), stderr: (t) => process.stderr.write(t), onEngine: (e) => { engine = e; } };
const program = new Command().exitOverride();
addEncodeCommand(program, io);
program.parseAsync(process.argv.slice(2), { from: "user" }).then(() => 0, (err) => {
  process.stderr.write(`tailsift: ${err.message}\n`);
  return typeof err.exitCode === "number" ? err.exitCode : 2;
}).then((code) => {
  removePendingTemps();
  process.exitCode = signalled ? (signalled === "SIGINT" ? 130 : 143) : code;
});
