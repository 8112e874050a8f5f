/** Worker thread for sky tiles of `umbra measure` / `umbra search` (started by ../pool.ts). */
import { serveJobs } from "../pool.js";
import { runTileJobFromManifest } from "./jobs.js";

serveJobs(runTileJobFromManifest);
