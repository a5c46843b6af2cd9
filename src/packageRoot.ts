/**
 * The folder holding headroom's package.json, found from this module's own location so it works
 * from src/ (under tsx), from dist/src/ (built) and when installed as a dependency.
 */
import { existsSync } from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";

function findRoot(start: string): string {
  let dir = start;
  while (!existsSync(join(dir, "package.json"))) {
    const parent = dirname(dir);
    if (parent === dir) throw new Error("headroom's package.json was not found above " + start);
    dir = parent;
  }
  return dir;
}

export const packageRoot: string = findRoot(dirname(fileURLToPath(import.meta.url)));
