#!/usr/bin/env -S npx tsx
/**
 * The `umbra` command. Each subcommand lives in `commands/<name>.ts` and exports `register`.
 * Exit codes: 0 ok, 1 failed checks (a regression or validation that ran but did not pass),
 * 2 bad input (any UmbraError a user caused), 3 internal error.
 */
import { Command, CommanderError } from "commander";
import { isUmbraError } from "@umbra/core";
import { COMMANDS } from "./commands/index.js";
import { VERSION } from "./version.js";

/** Build the program with every registered subcommand (exported for tests). */
export function buildProgram(): Command {
  const program = new Command("umbra")
    .description("Multi-frequency Sunyaev–Zel'dovich photometry of galaxy clusters.")
    .version(VERSION)
    .showHelpAfterError()
    .exitOverride();
  for (const register of COMMANDS) register(program);
  return program;
}

/** Run the CLI on `argv` (without node and script); resolves to the exit code. */
export async function run(argv: readonly string[]): Promise<number> {
  const program = buildProgram();
  try {
    await program.parseAsync([...argv], { from: "user" });
    return typeof process.exitCode === "number" ? process.exitCode : 0;
  } catch (e) {
    if (e instanceof CommanderError) {
      if (e.code === "commander.helpDisplayed" || e.code === "commander.version" || e.code === "commander.help") return 0;
      return 2; // commander already printed the one-line reason
    }
    if (isUmbraError(e)) {
      if (e.code === "INTERNAL") {
        process.stderr.write(`umbra: internal error: ${e.message}\n`);
        return 3;
      }
      process.stderr.write(`umbra: ${e.message}\n`);
      for (const p of e.problems) process.stderr.write(`  - ${p}\n`);
      return e.code === "NUMERIC" || e.code === "BAD_DATA" ? 1 : 2;
    }
    process.stderr.write(`umbra: internal error: ${e instanceof Error ? (e.stack ?? e.message) : String(e)}\n`);
    return 3;
  }
}

const invokedDirectly = process.argv[1] !== undefined && /main\.ts$/.test(process.argv[1]);
if (invokedDirectly) {
  run(process.argv.slice(2)).then((code) => {
    process.exitCode = code;
  });
}
