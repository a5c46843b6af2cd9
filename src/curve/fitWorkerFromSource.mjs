// Starts the fit worker from TypeScript source (under tsx or vitest): registers tsx in this worker
// thread, then loads the worker module. Built code loads dist/src/curve/fitWorker.js directly.
import { register } from "tsx/esm/api";

register();
await import("./fitWorker.ts");
