/**
 * The registry of subcommands. Each module exports `register(program)` that adds one command.
 * Add a line here when you add a command.
 */
import type { Command } from "commander";
import { register as registerDemo } from "./demo.js";
import { register as registerMerge } from "./merge.js";
import { register as registerRegress } from "./regress.js";
import { register as registerSearch } from "./search.js";
import { register as registerMeasure } from "./measure.js";
import { register as registerSed } from "./sed.js";
import { register as registerCluster } from "./cluster.js";
import { register as registerYMap } from "./ymap.js";
import { register as registerInspect } from "./inspect.js";
import { register as registerSimulate } from "./simulate.js";

/** Adds one subcommand to the program. */
export type RegisterCommand = (program: Command) => void;

export const COMMANDS: readonly RegisterCommand[] = [registerDemo, registerRegress, registerMerge, registerSearch, registerMeasure, registerSed, registerCluster, registerSimulate, registerYMap, registerInspect];
