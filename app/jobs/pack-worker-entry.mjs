// Worker threads do not take --import from execArgv on Node 20, so the worker registers tsx itself
// before loading the TypeScript worker.
import { register } from "tsx/esm/api";

register();
await import("./pack-worker.ts");
