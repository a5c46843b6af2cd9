/** headroom's version, read from package.json so there is one source of truth. */
import { readFileSync } from "node:fs";
import { packageRoot } from "./packageRoot.js";

export const toolVersion: string = (
  JSON.parse(readFileSync(`${packageRoot}/package.json`, "utf8")) as { version: string }
).version;
