/**
 * commands/optionChecks: checks every option a user typed, for every command, before the action
 * runs: a text option given as '' (or blanks) and a list option that names nothing are refused
 * with one line naming the option. (Numbers are checked by their parsers in commonOptions.)
 */
import { type Command, InvalidArgumentError } from "commander";

export function refuseBlankOptions(command: Command): void {
  for (const option of command.options) {
    const key = option.attributeName();
    if (command.getOptionValueSource(key) !== "cli") continue;
    const value: unknown = command.getOptionValue(key);
    const name = option.long ?? option.flags;
    if (typeof value === "string" && value.trim() === "" && name !== "--delimiter") {
      throw new InvalidArgumentError(`${name} needs a value, got an empty one`);
    }
    if (Array.isArray(value) && value.length === 0) throw new InvalidArgumentError(`${name} names nothing; give at least one name`);
  }
}
